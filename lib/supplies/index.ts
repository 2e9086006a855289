import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { HttpError, notFound } from '@/lib/http';
import { runReadPlan, statement, type ReadPlan } from '@/lib/db';
import { deleteFile, getFile, putFile } from '@/lib/storage';
import { gallonsToLiters, volumeToLiters } from '@/lib/units';
import type { ChemicalLotCreateInput, OilLotCreateInput } from '@/lib/validation/brewing';
import { ChemicalLot, OilLot, sequelize } from '@/models';
import type { CheckedUpload } from '@/lib/batches/upload';
import { checkLowStock } from './low-stock';

export type ChemicalKind = 'methanol' | 'KOH' | 'NaOH' | 'other';

/** A chemical lot as shown and sent: quantities in the lot's unit (L for methanol, g for catalysts). */
export interface ChemicalLotDto {
  id: number;
  kind: ChemicalKind;
  description: string | null;
  supplier: string;
  receivedOn: string;
  unit: 'L' | 'g';
  quantity: number;
  remaining: number;
  consumed: number;
  totalCostCents: number;
  purityPct: number | null;
  hasSafetyDataSheet: boolean;
  safetyDataSheetName: string | null;
  notes: string | null;
}

/** An oil lot with what batches have taken from it. */
export interface OilLotDto {
  id: number;
  collectedFrom: string;
  collectedOn: string;
  volumeLiters: number;
  usedLiters: number;
  remainingLiters: number;
  costCents: number;
  waterNotes: string | null;
  solidsNotes: string | null;
  titrationMl: number | null;
  titrant: 'KOH' | 'NaOH' | null;
}

export interface Paged<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}

interface ChemicalRow {
  id: number; kind: ChemicalKind; description: string | null; supplier: string; received_on: string; quantity_unit: 'L' | 'g';
  quantity: string; remaining_quantity: string; total_cost_cents: string; purity_pct: string | null; sds_file_key: string | null;
  sds_file_name: string | null; notes: string | null; total?: string;
}

function chemicalDto(r: ChemicalRow): ChemicalLotDto {
  const quantity = Number(r.quantity);
  const remaining = Number(r.remaining_quantity);
  return {
    id: r.id, kind: r.kind, description: r.description, supplier: r.supplier, receivedOn: r.received_on, unit: r.quantity_unit,
    quantity, remaining, consumed: Number((quantity - remaining).toFixed(3)), totalCostCents: Number(r.total_cost_cents),
    purityPct: r.purity_pct === null ? null : Number(r.purity_pct), hasSafetyDataSheet: Boolean(r.sds_file_key),
    safetyDataSheetName: r.sds_file_name, notes: r.notes,
  };
}

const CHEMICAL_SORT: Record<string, string> = {
  receivedOn: 'received_on', kind: 'kind', supplier: 'lower(supplier)', remaining: 'remaining_quantity', cost: 'total_cost_cents',
};

/**
 * Chemical lots of the actor's co-op, one page, newest first by default.
 * @param actor brewer or admin
 * @param q page, pageSize, sort (receivedOn|kind|supplier|remaining|cost), dir, optional kind
 */
export async function listChemicalLots(
  actor: Actor,
  q: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; kind?: ChemicalKind },
): Promise<Paged<ChemicalLotDto>> {
  const col = CHEMICAL_SORT[q.sort] ?? 'received_on';
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const rows = await sequelize.query<ChemicalRow>(
    `SELECT id, kind, description, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents, purity_pct,
            sds_file_key, sds_file_name, notes, count(*) OVER () AS total
       FROM chemical_lots WHERE coop_id = :coopId ${q.kind ? 'AND kind = :kind' : ''}
      ORDER BY ${col} ${dir}, id ${dir} LIMIT :limit OFFSET :offset`,
    { replacements: { coopId: actor.coop.id, kind: q.kind ?? null, limit: q.pageSize, offset: (q.page - 1) * q.pageSize }, type: QueryTypes.SELECT },
  );
  const total = rows[0] ? Number(rows[0].total) : await countWhere('chemical_lots', actor.coop.id, q.kind ? { kind: q.kind } : {});
  return { rows: rows.map(chemicalDto), total, page: q.page, pageSize: q.pageSize };
}

async function countWhere(table: 'chemical_lots' | 'oil_lots', coopId: number, extra: { kind?: string }): Promise<number> {
  const [r] = await sequelize.query<{ n: string }>(
    `SELECT count(*) AS n FROM ${table} WHERE coop_id = :coopId ${extra.kind ? 'AND kind = :kind' : ''}`,
    { replacements: { coopId, kind: extra.kind ?? null }, type: QueryTypes.SELECT },
  );
  return Number(r?.n ?? 0);
}

/** One chemical lot of the actor's co-op, or 404. */
export async function getChemicalLot(actor: Actor, id: number): Promise<ChemicalLotDto> {
  const [row] = await sequelize.query<ChemicalRow>(
    `SELECT * FROM chemical_lots WHERE id = :id AND coop_id = :coopId`,
    { replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT },
  );
  if (!row) throw notFound('Chemical lot not found.');
  return chemicalDto(row);
}

/** Converts a typed quantity to the stored unit: litres (from L or US gal) or grams (from g or kg). */
function toStoredQuantity(quantity: number, unit: 'L' | 'gal' | 'g' | 'kg'): { quantity: number; unit: 'L' | 'g' } {
  if (unit === 'gal') return { quantity: gallonsToLiters(quantity), unit: 'L' };
  if (unit === 'kg') return { quantity: quantity * 1000, unit: 'g' };
  return { quantity, unit };
}

/**
 * Records a chemical purchase (one lot). Methanol is stored in litres, catalysts in grams.
 * @param actor brewer or admin
 * @param input validated chemicalLotCreateSchema
 * @returns the new lot
 */
export async function createChemicalLot(actor: Actor, input: ChemicalLotCreateInput): Promise<ChemicalLotDto> {
  const stored = toStoredQuantity(input.quantity, input.unit);
  const qty = stored.quantity.toFixed(3);
  if (Number(qty) <= 0) throw new HttpError(422, 'Some fields need attention.', { quantity: ['Quantity is too small to record.'] });
  const created = await sequelize.transaction(async (transaction) => {
    const lot = await ChemicalLot.create(
      {
        coopId: actor.coop.id, kind: input.kind, description: input.description ?? null, supplier: input.supplier,
        receivedOn: input.receivedOn, quantityUnit: stored.unit, quantity: qty, remainingQuantity: qty,
        totalCostCents: String(input.totalCost), purityPct: input.purityPct === undefined ? null : input.purityPct.toFixed(2),
        notes: input.notes ?? null, createdByUserId: actor.user.id,
      },
      { transaction },
    );
    const dto = await readChemical(actor.coop.id, lot.id, transaction);
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'chemical-lot.create', entityType: 'chemical_lot', entityId: lot.id, after: dto }, transaction);
    return dto;
  });
  await checkLowStock(actor.coop.id);
  return created;
}

async function readChemical(coopId: number, id: number, transaction?: Transaction): Promise<ChemicalLotDto> {
  const [row] = await sequelize.query<ChemicalRow>(`SELECT * FROM chemical_lots WHERE id = :id AND coop_id = :coopId`, {
    replacements: { id, coopId }, type: QueryTypes.SELECT, transaction,
  });
  if (!row) throw notFound('Chemical lot not found.');
  return chemicalDto(row);
}

/**
 * Stores a safety data sheet (PDF) for a chemical lot under a server-made name, replacing any
 * earlier one.
 * @param actor brewer or admin
 * @param id chemical lot id (another co-op's → 404)
 * @param upload a checked PDF upload
 */
export async function attachSafetyDataSheet(actor: Actor, id: number, upload: CheckedUpload): Promise<ChemicalLotDto> {
  await readChemical(actor.coop.id, id); // 404 before writing a file
  const key = await putFile(actor.coop.id, upload.kind, upload.bytes);
  let previous: string | null = null;
  try {
    const dto = await sequelize.transaction(async (transaction) => {
      const [row] = await sequelize.query<{ sds_file_key: string | null; sds_file_name: string | null }>(
        `SELECT sds_file_key, sds_file_name FROM chemical_lots WHERE id = :id AND coop_id = :coopId FOR UPDATE`,
        { replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction },
      );
      if (!row) throw notFound('Chemical lot not found.');
      previous = row.sds_file_key;
      await sequelize.query(
        `UPDATE chemical_lots SET sds_file_key = :key, sds_file_name = :name, updated_at = now() WHERE id = :id AND coop_id = :coopId`,
        { replacements: { key, name: upload.name, id, coopId: actor.coop.id }, transaction },
      );
      await audit({
        coopId: actor.coop.id, actorUserId: actor.user.id, action: 'chemical-lot.sds', entityType: 'chemical_lot', entityId: id,
        before: { safetyDataSheet: row.sds_file_name }, after: { safetyDataSheet: upload.name, bytes: upload.bytes.length },
      }, transaction);
      return readChemical(actor.coop.id, id, transaction);
    });
    if (previous) await deleteFile(actor.coop.id, previous);
    return dto;
  } catch (e) {
    await deleteFile(actor.coop.id, key);
    throw e;
  }
}

/** The stored safety data sheet of a lot (404 when there is none or the lot is another co-op's). */
export async function getSafetyDataSheet(actor: Actor, id: number): Promise<{ bytes: Buffer; name: string }> {
  const [row] = await sequelize.query<{ sds_file_key: string | null; sds_file_name: string | null; kind: string }>(
    `SELECT sds_file_key, sds_file_name, kind FROM chemical_lots WHERE id = :id AND coop_id = :coopId`,
    { replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT },
  );
  if (!row?.sds_file_key) throw notFound('No safety data sheet for this lot.');
  return { bytes: await getFile(actor.coop.id, row.sds_file_key), name: row.sds_file_name ?? `sds-${row.kind}-${id}.pdf` };
}

// ---------------------------------------------------------------- oil lots

interface OilRow {
  id: number; collected_from: string; collected_on: string; volume_liters: string; used_liters: string; cost_cents: string;
  water_notes: string | null; solids_notes: string | null; titration_ml: string | null; titrant: 'KOH' | 'NaOH' | null; total?: string;
}

function oilDto(r: OilRow): OilLotDto {
  const volume = Number(r.volume_liters);
  const used = Number(r.used_liters ?? 0);
  return {
    id: r.id, collectedFrom: r.collected_from, collectedOn: r.collected_on, volumeLiters: volume, usedLiters: used,
    remainingLiters: Number(Math.max(0, volume - used).toFixed(3)), costCents: Number(r.cost_cents), waterNotes: r.water_notes,
    solidsNotes: r.solids_notes, titrationMl: r.titration_ml === null ? null : Number(r.titration_ml), titrant: r.titrant,
  };
}

const OIL_SELECT = `SELECT o.id, o.collected_from, o.collected_on, o.volume_liters, o.cost_cents, o.water_notes, o.solids_notes,
    o.titration_ml, o.titrant, COALESCE(u.used, 0) AS used_liters
  FROM oil_lots o
  LEFT JOIN LATERAL (SELECT sum(bol.liters) AS used FROM batch_oil_lots bol WHERE bol.oil_lot_id = o.id AND bol.coop_id = o.coop_id) u ON true`;

const OIL_SORT: Record<string, string> = {
  collectedOn: 'o.collected_on', collectedFrom: 'lower(o.collected_from)', volume: 'o.volume_liters', titration: 'o.titration_ml',
};

/** Oil lots of the actor's co-op, one page, with litres already used by batches. */
export async function listOilLots(actor: Actor, q: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc' }): Promise<Paged<OilLotDto>> {
  const col = OIL_SORT[q.sort] ?? 'o.collected_on';
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const rows = await sequelize.query<OilRow>(
    `${OIL_SELECT} WHERE o.coop_id = :coopId ORDER BY ${col} ${dir} NULLS LAST, o.id ${dir} LIMIT :limit OFFSET :offset`,
    { replacements: { coopId: actor.coop.id, limit: q.pageSize, offset: (q.page - 1) * q.pageSize }, type: QueryTypes.SELECT },
  );
  return { rows: rows.map(oilDto), total: await countWhere('oil_lots', actor.coop.id, {}), page: q.page, pageSize: q.pageSize };
}

/** Oil lots that still hold oil (for the planner and batch forms), oldest first. */
export async function listOilLotsWithOil(actor: Actor): Promise<OilLotDto[]> {
  const rows = await sequelize.query<OilRow>(
    `${OIL_SELECT} WHERE o.coop_id = :coopId AND o.volume_liters > COALESCE(u.used, 0) ORDER BY o.collected_on, o.id LIMIT 200`,
    { replacements: { coopId: actor.coop.id }, type: QueryTypes.SELECT },
  );
  return rows.map(oilDto);
}

/** One oil lot of the actor's co-op (404 otherwise), optionally locked for the caller's transaction. */
export async function getOilLot(actor: Actor, id: number, transaction?: Transaction): Promise<OilLotDto> {
  if (transaction) {
    await sequelize.query(`SELECT id FROM oil_lots WHERE id = :id AND coop_id = :coopId FOR UPDATE`, {
      replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction,
    });
  }
  const [row] = await sequelize.query<OilRow>(`${OIL_SELECT} WHERE o.id = :id AND o.coop_id = :coopId`, {
    replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction,
  });
  if (!row) throw notFound('Oil lot not found.');
  return oilDto(row);
}

/**
 * Records collected oil. The volume is typed in the co-op's units and stored in litres; a
 * titration without a titrant is taken as made with the co-op's usual catalyst.
 */
export async function createOilLot(actor: Actor, input: OilLotCreateInput): Promise<OilLotDto> {
  const liters = volumeToLiters(input.volume, actor.coop.units).toFixed(3);
  const titrant = input.titrationMl === undefined ? null : (input.titrant ?? actor.coop.settings.recipe?.catalyst ?? 'KOH');
  return sequelize.transaction(async (transaction) => {
    const lot = await OilLot.create(
      {
        coopId: actor.coop.id, collectedFrom: input.collectedFrom, collectedOn: input.collectedOn, volumeLiters: liters,
        costCents: String(input.cost ?? 0), waterNotes: input.waterNotes ?? null, solidsNotes: input.solidsNotes ?? null,
        titrationMl: input.titrationMl === undefined ? null : input.titrationMl.toFixed(2), titrant, createdByUserId: actor.user.id,
      },
      { transaction },
    );
    const dto = await getOilLot(actor, lot.id, transaction);
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'oil-lot.create', entityType: 'oil_lot', entityId: lot.id, after: dto }, transaction);
    return dto;
  });
}

// ---------------------------------------------------------------- stock

/** Stock of one chemical: what the lots hold, what batches under way will take, what is free. */
export interface StockLine {
  kind: 'methanol' | 'KOH' | 'NaOH';
  unit: 'L' | 'g';
  /** Sum of what the lots still hold (received − consumed by released or rejected batches). */
  onHand: number;
  /** Planned amounts of batches already under way (reacting … testing): in the reactor, not yet written off. */
  committed: number;
  /** onHand − committed. */
  available: number;
  lotsWithStock: number;
  /** What the next planned batch needs of this chemical (null when there is none or it uses the other catalyst). */
  nextPlannedNeed: number | null;
  /** True when the available stock won't cover the next planned batch. */
  low: boolean;
}

export interface StockSummary {
  lines: StockLine[];
  nextPlannedBatch: { id: number; number: number; catalyst: 'KOH' | 'NaOH' } | null;
}

/** How much of each batch's chemicals counts: what was actually used when recorded, else the plan. */
const NEED_METHANOL = 'COALESCE(actual_methanol_liters, computed_methanol_liters)';
const NEED_CATALYST = 'COALESCE(actual_catalyst_grams, computed_catalyst_grams)';

/**
 * Stock on hand per chemical, what batches under way have committed, and the low-stock flag:
 * low when the available stock won't cover the next planned batch (the earliest in status
 * 'planned').
 */
export async function stockSummary(actor: Actor, transaction?: Transaction): Promise<StockSummary> {
  const { lots, needs } = await stockState(actor.coop.id, transaction);
  return summarizeStock(lots, needs);
}

/** A chemical lot that still holds stock. `receivedAtMs` is the day received (UTC midnight, ms), the FIFO key. */
export interface HeldLot { id: number; kind: 'methanol' | 'KOH' | 'NaOH'; receivedAtMs: number; quantity: number; remaining: number; totalCostCents: number; purityPct: number | null }

/**
 * The co-op's lots of these chemicals that still hold stock, oldest first (FIFO order), from the
 * partial index on lots with remaining stock. One row per kind carrying its lots as one JSON
 * array, so the app parses one value per kind instead of seven columns per lot.
 */
const HELD_LOTS = statement(
  `SELECT kind, json_agg(json_build_array(id, (extract(epoch FROM received_on) * 1000)::bigint, quantity, remaining_quantity, total_cost_cents, purity_pct)
                         ORDER BY received_on, id) AS lots
     FROM chemical_lots WHERE coop_id = $1 AND kind = ANY($2) AND remaining_quantity > 0 GROUP BY kind`,
  'tv_held_lots',
);

type HeldLotsRow = { kind: HeldLot['kind']; lots: [number, number, number, number, number, number | null][] };

const heldLots = (rows: HeldLotsRow[]): HeldLot[] =>
  rows.flatMap(({ kind, lots }) =>
    lots.map(([id, receivedAtMs, quantity, remaining, totalCostCents, purityPct]) => ({ id, kind, receivedAtMs, quantity, remaining, totalCostCents, purityPct })),
  );

/**
 * Stock on hand per chemical as one aggregated entry per kind (summed in SQL), for summaries
 * that need totals only — e.g. the overview — instead of every lot with stock.
 */
export const STOCK_TOTALS = statement(
  `SELECT kind, SUM(remaining_quantity) AS remaining, SUM(quantity) AS quantity, SUM(total_cost_cents) AS cost FROM chemical_lots
    WHERE coop_id = $1 AND kind = ANY($2) AND remaining_quantity > 0 GROUP BY kind`,
  'tv_stock_totals',
);

export type StockTotalsRow = { kind: HeldLot['kind']; remaining: string; quantity: string; cost: string };

/** The STOCK_TOTALS rows as one held "lot" per kind. */
export const stockTotalsOf = (rows: StockTotalsRow[]): HeldLot[] =>
  rows.map((r, i) => ({
    id: -(i + 1), kind: r.kind, receivedAtMs: 0, quantity: Number(r.quantity), remaining: Number(r.remaining),
    totalCostCents: Number(r.cost), purityPct: null,
  }));

/** What batches under way have committed of each chemical, and the next planned batch with its needs. */
export interface BatchNeeds {
  committed: Record<'methanol' | 'KOH' | 'NaOH', number>;
  next: { id: number; number: number; catalyst: 'KOH' | 'NaOH'; methanolLiters: number; catalystGrams: number; batchDate: string; oilLiters: number } | null;
}

export const BATCH_NEEDS = statement(
  `SELECT w.methanol_committed, w.koh_committed, w.naoh_committed,
          n.id AS next_id, n.number AS next_number, n.catalyst AS next_catalyst, n.methanol AS next_methanol, n.catalyst_grams AS next_catalyst_grams,
          n.batch_date AS next_batch_date, n.oil_liters AS next_oil_liters
     FROM (SELECT COALESCE(sum(${NEED_METHANOL}), 0) AS methanol_committed,
                  COALESCE(sum(${NEED_CATALYST}) FILTER (WHERE catalyst = 'KOH'), 0) AS koh_committed,
                  COALESCE(sum(${NEED_CATALYST}) FILTER (WHERE catalyst = 'NaOH'), 0) AS naoh_committed
             FROM batches WHERE coop_id = $1 AND status IN ('reacting','settling','draining','washing','drying','testing')) w
     LEFT JOIN LATERAL (SELECT id, number, catalyst, ${NEED_METHANOL} AS methanol, ${NEED_CATALYST} AS catalyst_grams,
                               to_char(batch_date, 'YYYY-MM-DD') AS batch_date, oil_liters
             FROM batches WHERE coop_id = $1 AND status = 'planned' ORDER BY batch_date, number LIMIT 1) n ON true`,
  'tv_batch_needs',
);

export type BatchNeedsRow = Record<string, string | number | null>;

export function batchNeedsOf(r: BatchNeedsRow | undefined): BatchNeeds {
  const row = r ?? {};
  return {
    committed: { methanol: Number(row.methanol_committed ?? 0), KOH: Number(row.koh_committed ?? 0), NaOH: Number(row.naoh_committed ?? 0) },
    next: row.next_id
      ? {
          id: Number(row.next_id), number: Number(row.next_number), catalyst: row.next_catalyst as 'KOH' | 'NaOH', methanolLiters: Number(row.next_methanol),
          catalystGrams: Number(row.next_catalyst_grams), batchDate: String(row.next_batch_date), oilLiters: Number(row.next_oil_liters),
        }
      : null,
  };
}

/** The lots holding methanol, KOH or NaOH (FIFO order) and the batches' needs, read in one round trip. */
export function stockStatePlan(coopId: number): ReadPlan<{ lots: HeldLot[]; needs: BatchNeeds }> {
  return {
    reads: [[HELD_LOTS, [coopId, ['methanol', 'KOH', 'NaOH']]], [BATCH_NEEDS, [coopId]]],
    finish: ([lots, needs]) => ({ lots: heldLots(lots as HeldLotsRow[]), needs: batchNeedsOf((needs as BatchNeedsRow[])[0]) }),
  };
}

export function stockState(coopId: number, transaction?: Transaction): Promise<{ lots: HeldLot[]; needs: BatchNeeds }> {
  return runReadPlan(stockStatePlan(coopId), transaction);
}

/** Stock lines from the lots holding stock and the batches' needs (pure). */
export function summarizeStock(lots: HeldLot[], needs: BatchNeeds): StockSummary {
  const next = needs.next;
  const line = (kind: StockLine['kind'], unit: 'L' | 'g', need: number | null): StockLine => {
    const mine = lots.filter((l) => l.kind === kind);
    const onHand = Number(mine.reduce((a, l) => a + l.remaining, 0).toFixed(3));
    const committed = needs.committed[kind];
    const available = Number((onHand - committed).toFixed(3));
    return { kind, unit, onHand, committed, available, lotsWithStock: mine.length, nextPlannedNeed: need, low: need !== null && available < need };
  };
  return {
    nextPlannedBatch: next ? { id: next.id, number: next.number, catalyst: next.catalyst } : null,
    lines: [
      line('methanol', 'L', next ? next.methanolLiters : null),
      line('KOH', 'g', next?.catalyst === 'KOH' ? next.catalystGrams : null),
      line('NaOH', 'g', next?.catalyst === 'NaOH' ? next.catalystGrams : null),
    ],
  };
}

/** Active tanks of the co-op, for the release form. */
export async function listTanks(actor: Actor): Promise<{ id: number; name: string; capacityLiters: number; onHandLiters: number }[]> {
  const rows = await sequelize.query<{ id: number; name: string; capacity_liters: string; on_hand_liters: string }>(
    `SELECT id, name, capacity_liters, on_hand_liters FROM tanks WHERE coop_id = :coopId AND active ORDER BY name`,
    { replacements: { coopId: actor.coop.id }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, name: r.name, capacityLiters: Number(r.capacity_liters), onHandLiters: Number(r.on_hand_liters) }));
}
