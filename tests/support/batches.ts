import { sql } from './api';

/**
 * Inserts a batch row directly (tests only): a plain KOH plan for `oilLiters` of oil with the
 * computed methanol and catalyst given; `released` adds the release columns (costs by kind, the
 * total as their sum, and the per-gallon figure), `rejected` the rejection columns.
 */
export async function insertBatch(
  coopId: number,
  b: {
    number: number;
    status?: string;
    oilLiters?: number;
    methanolLiters?: number;
    catalystGrams?: number;
    catalyst?: 'KOH' | 'NaOH';
    batchDate?: string;
    released?: {
      at: string;
      tankId: number;
      liters: string;
      costs: { methanol: number; catalyst: number; energy: number; feedstock: number; other: number };
    };
    rejected?: { at: string; reason: string };
  },
): Promise<number> {
  const status = b.released ? 'released' : b.rejected ? 'rejected' : (b.status ?? 'planned');
  const c = b.released?.costs;
  const total = c ? c.methanol + c.catalyst + c.energy + c.feedstock + c.other : null;
  const perGallon = c && b.released ? Math.round((total! * 3.785411784) / Number(b.released.liters)) : null;
  const [row] = await sql<{ id: number }>(
    `INSERT INTO batches (coop_id, number, status, batch_date, oil_liters, titration_trials_ml, titrant, titration_avg_ml, catalyst, base_g_per_l,
       purity_pct, titrant_from, catalyst_rule, methanol_mode, methanol_pct, computed_catalyst_grams, computed_methanol_liters,
       tank_id, released_liters, released_at, rejected_at, reject_reason,
       cost_methanol_cents, cost_catalyst_cents, cost_energy_cents, cost_feedstock_cents, cost_other_cents, total_cost_cents, cost_per_gallon_cents)
     VALUES ($1, $2, $3, COALESCE($4::date, current_date), $5, '[1.5,1.6,1.4]', $6, 1.5, $6, 3.5, 90, 'same-catalyst', 'test', 'percent', 20, $7, $8,
       $9, $10, $11, $12, $13, $14, $15, $16, $17, $18, $19, $20) RETURNING id`,
    [
      coopId,
      b.number,
      status,
      b.batchDate ?? null,
      b.oilLiters ?? 100,
      b.catalyst ?? 'KOH',
      b.catalystGrams ?? 500,
      b.methanolLiters ?? 20,
      b.released?.tankId ?? null,
      b.released?.liters ?? null,
      b.released?.at ?? null,
      b.rejected?.at ?? null,
      b.rejected?.reason ?? null,
      c?.methanol ?? null,
      c?.catalyst ?? null,
      c?.energy ?? null,
      c?.feedstock ?? null,
      c?.other ?? null,
      total,
      perGallon,
    ],
  );
  return row!.id;
}
