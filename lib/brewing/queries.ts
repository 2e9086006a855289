import 'server-only';
import { QueryTypes, type InferAttributes, type Transaction } from 'sequelize';
import { sequelize, type Batch, type ChemicalLot } from '@/models';

/**
 * The statements of batches that a model call can't say. Every value is bound ($1, $2 …), never
 * spliced into the text.
 */

/** Advisory-lock key space of batch numbering (the first half of `pg_advisory_xact_lock(key, coopId)`). */
const BATCH_NUMBER_LOCK = 7301;

/**
 * Serialises numbering of a co-op's new batches until the transaction ends, so two batches created
 * at once can't take the same next number (max(number) + 1) — without locking the co-op row.
 */
export async function lockBatchNumbers(coopId: number, transaction: Transaction): Promise<void> {
  await sequelize.query('SELECT pg_advisory_xact_lock($1, $2)', { bind: [BATCH_NUMBER_LOCK, coopId], transaction });
}

/** A batch with fuel out (NUMERIC litres as text), for the yield projection. */
export type YieldHistoryRow = Pick<InferAttributes<Batch>, 'oilLiters'> & { releasedLiters: string };
/** The last lot bought of a chemical that says how much it held (NUMERIC and BIGINT as text). */
export type LastLotPriceRow = Pick<InferAttributes<ChemicalLot>, 'kind' | 'quantity' | 'totalCostCents'>;

/**
 * The planner's history in one round trip (it was three model reads, each a Sequelize build and
 * a socket write on every planner request; bench/README.md): the co-op's `historyLimit` latest
 * released or imported batches with fuel out, newest release first (index batches_yield_history;
 * imported past batches carry oil in and fuel out as recorded, so they are yield history too), and
 * for each of `kinds` the last lot received with a quantity (index chemical_lots_received).
 */
export async function plannerHistory(p: {
  coopId: number;
  historyLimit: number;
  kinds: string[];
}): Promise<{ history: YieldHistoryRow[]; prices: LastLotPriceRow[] }> {
  const [row] = await sequelize.query<{ history: YieldHistoryRow[]; prices: LastLotPriceRow[] }>(
    `SELECT
       (SELECT COALESCE(json_agg(json_build_object('oilLiters', h.oil_liters::text, 'releasedLiters', h.released_liters::text)
                                 ORDER BY h.released_at DESC, h.id DESC), '[]')
          FROM (SELECT oil_liters, released_liters, released_at, id FROM batches
                WHERE coop_id = $coopId AND status IN ('released', 'imported') AND released_liters IS NOT NULL
                ORDER BY released_at DESC, id DESC LIMIT $historyLimit) h) AS history,
       (SELECT COALESCE(json_agg(l), '[]')
          FROM unnest($kinds::text[]) AS k(kind)
          CROSS JOIN LATERAL (SELECT chemical_lots.kind, quantity::text, total_cost_cents::text AS "totalCostCents" FROM chemical_lots
                              WHERE coop_id = $coopId AND chemical_lots.kind = k.kind AND quantity > 0
                              ORDER BY received_on DESC, id DESC LIMIT 1) l) AS prices`,
    { bind: p, type: QueryTypes.SELECT },
  );
  return row!; // a SELECT without FROM always yields one row
}
