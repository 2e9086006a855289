import { assertCents, roundHalfUp } from '../money';
import { LITERS_PER_US_GALLON } from '../units';

/**
 * Stock valued at moving weighted-average cost. The value is kept as integer cents and the
 * average is derived (value ÷ quantity), so no rounding error accumulates in the average.
 */
export interface MovingAverageState {
  qtyLiters: number;
  totalValueCents: number;
}

/** A tank movement for {@link recomputeMovingAverage}. */
export type TankMovement = { kind: 'in'; liters: number; valueCents: number } | { kind: 'out'; liters: number };

/** One step of {@link recomputeMovingAverage}. */
export interface MovingAverageStep {
  movement: TankMovement;
  /** Value added (in) or removed (out), cents; positive either way. */
  valueCents: number;
  state: MovingAverageState;
}

/** An empty tank. */
export const EMPTY_STOCK: MovingAverageState = Object.freeze({ qtyLiters: 0, totalValueCents: 0 });

/** Quantities are stored with 3 decimals; arithmetic noise below this is treated as zero. */
const QTY_EPSILON = 1e-9;

function cleanQty(qty: number): number {
  const cleaned = Math.round(qty * 1e6) / 1e6;
  return Math.abs(cleaned) < QTY_EPSILON ? 0 : cleaned;
}

function assertState(state: MovingAverageState): void {
  if (!Number.isFinite(state.qtyLiters) || state.qtyLiters < 0) throw new RangeError('qtyLiters must be ≥ 0');
  assertCents(state.totalValueCents, 'totalValueCents');
}

/**
 * Adds fuel to stock at its cost.
 * @param state current stock
 * @param inflowLiters litres added (> 0)
 * @param inflowValueCents cost of the litres added, integer cents (e.g. a batch's total cost)
 * @returns the new stock (the input is not modified)
 */
export function applyInflow(
  state: MovingAverageState,
  inflowLiters: number,
  inflowValueCents: number,
): MovingAverageState {
  assertState(state);
  if (!Number.isFinite(inflowLiters) || inflowLiters <= 0)
    throw new RangeError(`Inflow must be > 0 L, got ${inflowLiters}`);
  assertCents(inflowValueCents, 'inflowValueCents');
  if (inflowValueCents < 0) throw new RangeError('Inflow value must be ≥ 0 cents');
  return {
    qtyLiters: cleanQty(state.qtyLiters + inflowLiters),
    totalValueCents: state.totalValueCents + inflowValueCents,
  };
}

/**
 * Removes fuel from stock at the current average cost. The value removed is the proportional
 * share of the stock's value, rounded to the cent (lib/money rule); emptying the stock removes
 * exactly all of its value.
 * @param state current stock
 * @param outflowLiters litres removed (> 0, at most the quantity on hand)
 * @returns the new stock and the value removed in cents
 * @throws RangeError if more is drawn than is on hand
 */
export function applyOutflow(
  state: MovingAverageState,
  outflowLiters: number,
): { state: MovingAverageState; valueCents: number } {
  assertState(state);
  if (!Number.isFinite(outflowLiters) || outflowLiters <= 0)
    throw new RangeError(`Outflow must be > 0 L, got ${outflowLiters}`);
  if (outflowLiters > state.qtyLiters + QTY_EPSILON) {
    throw new RangeError(`Outflow of ${outflowLiters} L exceeds the ${state.qtyLiters} L on hand`);
  }
  const empties = outflowLiters >= state.qtyLiters - QTY_EPSILON;
  const valueCents = empties
    ? state.totalValueCents
    : roundHalfUp((state.totalValueCents * outflowLiters) / state.qtyLiters);
  return {
    state: {
      qtyLiters: empties ? 0 : cleanQty(state.qtyLiters - outflowLiters),
      totalValueCents: state.totalValueCents - valueCents,
    },
    valueCents,
  };
}

/**
 * Average cost per litre of the stock (unrounded).
 * @param state current stock
 * @returns cents per litre, or null when the stock is empty
 */
export function averageCostCentsPerLiter(state: MovingAverageState): number | null {
  return state.qtyLiters > QTY_EPSILON ? state.totalValueCents / state.qtyLiters : null;
}

/**
 * Average cost per US gallon of the stock, rounded half up to the cent (lib/money rule).
 * @param state current stock
 * @returns integer cents per gallon, or null when the stock is empty
 */
export function averageCostCentsPerGallon(state: MovingAverageState): number | null {
  const perLiter = averageCostCentsPerLiter(state);
  return perLiter === null ? null : roundHalfUp(perLiter * LITERS_PER_US_GALLON);
}

/**
 * Replays a list of tank movements (in date order) to rebuild the moving-average stock.
 * @param movements inflows with their value in cents, and outflows
 * @param initial starting stock (default empty)
 * @returns the final stock and each step with the value moved
 */
export function recomputeMovingAverage(
  movements: readonly TankMovement[],
  initial: MovingAverageState = EMPTY_STOCK,
): { state: MovingAverageState; steps: MovingAverageStep[] } {
  let state = initial;
  const steps: MovingAverageStep[] = [];
  for (const movement of movements) {
    if (movement.kind === 'in') {
      state = applyInflow(state, movement.liters, movement.valueCents);
      steps.push({ movement, valueCents: movement.valueCents, state });
    } else {
      const result = applyOutflow(state, movement.liters);
      state = result.state;
      steps.push({ movement, valueCents: result.valueCents, state });
    }
  }
  return { state, steps };
}
