import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import type { LowStockAlert, LowStockChemical } from '@/models/LowStockAlert';

/**
 * The statements of supplies that a model call can't say. Every value is bound ($1, $2 …), never
 * spliced into the text.
 */

/**
 * Flips one chemical's low-stock state to 'low' unless it already is (an upsert guarded on the
 * row: `… DO UPDATE … WHERE state <> 'low' RETURNING`), so of concurrent callers exactly one sees
 * the crossing and sends the e-mail.
 * @returns true when this call made the crossing
 */
export async function flipLowStockToLow(coopId: number, chemical: LowStockChemical): Promise<boolean> {
  const rows = await sequelize.query<Pick<LowStockAlert, 'chemical'>>(
    `INSERT INTO low_stock_alerts (coop_id, chemical, state, changed_at, last_sent_at) VALUES ($1, $2, 'low', now(), now())
     ON CONFLICT (coop_id, chemical) DO UPDATE SET state = 'low', changed_at = now(), last_sent_at = now()
     WHERE low_stock_alerts.state <> 'low' RETURNING chemical`,
    { bind: [coopId, chemical], type: QueryTypes.SELECT },
  );
  return rows.length > 0;
}

/** One lot holding stock, or (totals) one row per chemical with the sums; decimals as text. */
export interface StockLotRow {
  id: number;
  kind: 'methanol' | 'KOH' | 'NaOH';
  receivedOn: string | null;
  quantity: string;
  remaining: string;
  totalCostCents: string;
  purityPct: string | null;
}
/** What batches under way have committed, per catalyst (methanol L, catalyst g as text). */
export interface CommittedRow {
  catalyst: 'KOH' | 'NaOH';
  methanolLiters: string | null;
  catalystGrams: string | null;
}
/** The next planned batch (earliest date, then number) and what it needs. */
export interface NextPlannedRow {
  id: number;
  number: number;
  catalyst: 'KOH' | 'NaOH';
  batchDate: string;
  oilLiters: string;
  methanolLiters: string;
  catalystGrams: string;
}

/** The stock picture's three columns as they arrive (json). */
export interface StockPictureRow {
  lots: StockLotRow[];
  committed: CommittedRow[];
  next: NextPlannedRow | null;
}

/**
 * The chemical stock picture's select items (lots, committed, next), bound by name: $coopId,
 * $kinds, $underWay, $totals. The lots of `kinds` still holding stock in FIFO order (or, with
 * `totals`, one summed row per chemical), what batches in `underWay` have committed per catalyst
 * (what was actually used when recorded, else the plan), and the next planned batch with its
 * needs. Shared by stockPicture and the overview's cards statement (lib/overview/queries.ts),
 * which reads it in the same round trip as its other figures.
 */
export const STOCK_PICTURE_COLUMNS = `
       CASE WHEN $totals THEN (SELECT COALESCE(json_agg(x ORDER BY x.kind), '[]') FROM (
          SELECT -MIN(id) AS id, kind, NULL AS "receivedOn", SUM(quantity)::text AS quantity, SUM(remaining_quantity)::text AS remaining,
                 SUM(total_cost_cents)::text AS "totalCostCents", NULL AS "purityPct"
          FROM chemical_lots WHERE coop_id = $coopId AND kind = ANY($kinds) AND remaining_quantity > 0 GROUP BY kind) x)
       ELSE (SELECT COALESCE(json_agg(x ORDER BY x."receivedOn", x.id), '[]') FROM (
          SELECT id, kind, received_on AS "receivedOn", quantity::text, remaining_quantity::text AS remaining,
                 total_cost_cents::text AS "totalCostCents", purity_pct::text AS "purityPct"
          FROM chemical_lots WHERE coop_id = $coopId AND kind = ANY($kinds) AND remaining_quantity > 0) x) END AS lots,
       (SELECT COALESCE(json_agg(x), '[]') FROM (
          SELECT catalyst, SUM(COALESCE(actual_methanol_liters, computed_methanol_liters))::text AS "methanolLiters",
                 SUM(COALESCE(actual_catalyst_grams, computed_catalyst_grams))::text AS "catalystGrams"
          FROM batches WHERE coop_id = $coopId AND status = ANY($underWay) GROUP BY catalyst) x) AS committed,
       (SELECT row_to_json(x) FROM (
          SELECT id, number, catalyst, batch_date AS "batchDate", oil_liters::text AS "oilLiters",
                 COALESCE(actual_methanol_liters, computed_methanol_liters)::text AS "methanolLiters",
                 COALESCE(actual_catalyst_grams, computed_catalyst_grams)::text AS "catalystGrams"
          FROM batches WHERE coop_id = $coopId AND status = 'planned' ORDER BY batch_date, number LIMIT 1) x) AS next`;

/** The values STOCK_PICTURE_COLUMNS binds. */
export type StockPictureParams = {
  coopId: number;
  kinds: string[];
  underWay: string[];
  totals: boolean;
};

/**
 * The chemical stock picture in one round trip (it was three reads on every overview, planner and
 * supplies request): STOCK_PICTURE_COLUMNS.
 */
export async function stockPicture(p: StockPictureParams, transaction?: Transaction): Promise<StockPictureRow> {
  const [row] = await sequelize.query<StockPictureRow>(`SELECT ${STOCK_PICTURE_COLUMNS}`, {
    bind: p,
    type: QueryTypes.SELECT,
    transaction,
  });
  return row!; // a SELECT without FROM always yields one row
}
