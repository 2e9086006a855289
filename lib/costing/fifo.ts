import { assertCents, roundHalfUp } from '../money';

/** Fields common to every lot offered to {@link consumeFifo}. */
interface FifoLotBase {
  id: string | number;
  /** When the lot was received; oldest is consumed first. ISO string, Date or epoch milliseconds. */
  receivedAt: Date | string | number;
  /** Quantity still on hand, in the lot's unit (L, kg …). */
  remainingQty: number;
}

/**
 * A lot priced by its purchase: `totalCostCents` for `qty` units. Exact: once a lot is fully
 * consumed (over any number of calls), its allocations add up to `totalCostCents`.
 */
export interface FifoLotByTotal extends FifoLotBase {
  /** Quantity purchased (original size of the lot). */
  qty: number;
  /** Price paid for the whole lot, integer cents. */
  totalCostCents: number;
}

/** A lot priced per unit (each allocation is rounded on its own; prefer {@link FifoLotByTotal}). */
export interface FifoLotByUnitCost extends FifoLotBase {
  unitCostCentsPerUnit: number;
}

export type FifoLot = FifoLotByTotal | FifoLotByUnitCost;

/** One slice taken from one lot. */
export interface FifoAllocation {
  lotId: string | number;
  qty: number;
  costCents: number;
  /** Quantity left in the lot after this allocation. */
  remainingQtyAfter: number;
}

/** Result of {@link consumeFifo}. */
export interface FifoResult {
  allocations: FifoAllocation[];
  /** Quantity that no lot could cover (0 when stock sufficed). */
  shortfallQty: number;
  /** Quantity actually allocated. */
  allocatedQty: number;
  totalCostCents: number;
}

/** Quantities are stored with 3 decimals; arithmetic noise below this is treated as zero. */
const QTY_EPSILON = 1e-9;

/** Rounds away floating-point noise in quantities (stored with 3 decimals). */
function cleanQty(qty: number): number {
  const cleaned = Math.round(qty * 1e6) / 1e6;
  return Math.abs(cleaned) < QTY_EPSILON ? 0 : cleaned;
}

function receivedTime(lot: FifoLot): number {
  const r = lot.receivedAt;
  const time = typeof r === 'number' ? r : (r instanceof Date ? r : new Date(r)).getTime();
  if (Number.isNaN(time)) throw new RangeError(`Lot ${String(lot.id)} has an invalid receivedAt`);
  return time;
}

function compareIds(a: string | number, b: string | number): number {
  if (typeof a === 'number' && typeof b === 'number') return a - b;
  const sa = String(a);
  const sb = String(b);
  return sa < sb ? -1 : sa > sb ? 1 : 0;
}

function costOfTaking(lot: FifoLot, takeQty: number): number {
  if ('totalCostCents' in lot) {
    // Cost of the cumulative quantity consumed is rounded, and each slice is the difference,
    // so the slices of a lot always add up to its total cost once it is used up.
    const consumedBefore = lot.qty - lot.remainingQty;
    const consumedAfter = consumedBefore + takeQty;
    const valueAt = (consumed: number) =>
      consumed >= lot.qty - QTY_EPSILON ? lot.totalCostCents : roundHalfUp((lot.totalCostCents * consumed) / lot.qty);
    return valueAt(consumedAfter) - valueAt(consumedBefore);
  }
  return roundHalfUp(lot.unitCostCentsPerUnit * takeQty);
}

function validateLot(lot: FifoLot): void {
  if (!Number.isFinite(lot.remainingQty) || lot.remainingQty < 0) {
    throw new RangeError(`Lot ${String(lot.id)}: remainingQty must be ≥ 0`);
  }
  if ('totalCostCents' in lot) {
    assertCents(lot.totalCostCents, `Lot ${String(lot.id)} totalCostCents`);
    if (lot.totalCostCents < 0) throw new RangeError(`Lot ${String(lot.id)}: totalCostCents must be ≥ 0`);
    if (!Number.isFinite(lot.qty) || lot.qty <= 0) throw new RangeError(`Lot ${String(lot.id)}: qty must be > 0`);
    if (lot.remainingQty > lot.qty + QTY_EPSILON)
      throw new RangeError(`Lot ${String(lot.id)}: remainingQty exceeds qty`);
  } else if (!Number.isFinite(lot.unitCostCentsPerUnit) || lot.unitCostCentsPerUnit < 0) {
    throw new RangeError(`Lot ${String(lot.id)}: unitCostCentsPerUnit must be ≥ 0`);
  }
}

/**
 * Takes a quantity from stock lots first in, first out (oldest `receivedAt` first, ties by id)
 * and prices each slice in integer cents. Does not mutate the lots; the caller stores
 * `remainingQtyAfter` for each allocation.
 * @param lots the lots on hand (any order; empty lots are skipped)
 * @param qtyNeeded quantity to consume, in the lots' unit
 * @returns the allocations, any shortfall, and the total cost in cents
 */
export function consumeFifo(lots: readonly FifoLot[], qtyNeeded: number): FifoResult {
  if (!Number.isFinite(qtyNeeded) || qtyNeeded < 0)
    throw new RangeError(`Quantity needed must be ≥ 0, got ${qtyNeeded}`);
  lots.forEach(validateLot);
  const ordered = lots
    .map((lot) => ({ lot, time: receivedTime(lot) }))
    .sort((a, b) => a.time - b.time || compareIds(a.lot.id, b.lot.id))
    .map(({ lot }) => lot);

  const allocations: FifoAllocation[] = [];
  let stillNeeded = qtyNeeded;
  for (const lot of ordered) {
    if (stillNeeded <= QTY_EPSILON) break;
    if (lot.remainingQty <= QTY_EPSILON) continue;
    const takesAll = lot.remainingQty <= stillNeeded + QTY_EPSILON;
    const take = takesAll ? lot.remainingQty : stillNeeded;
    allocations.push({
      lotId: lot.id,
      qty: cleanQty(take),
      costCents: costOfTaking(lot, take),
      remainingQtyAfter: takesAll ? 0 : cleanQty(lot.remainingQty - take),
    });
    stillNeeded = takesAll ? stillNeeded - take : 0;
  }
  const shortfallQty = cleanQty(Math.max(0, stillNeeded));
  return {
    allocations,
    shortfallQty,
    allocatedQty: cleanQty(qtyNeeded - shortfallQty),
    totalCostCents: allocations.reduce((acc, a) => acc + a.costCents, 0),
  };
}
