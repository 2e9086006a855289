// The benchmark co-op shared by the overview and mixed-traffic benchmarks: 300 members, 5 tanks,
// 50,000 draws, 2,000 batches (1,900 released), chemical lots and 3,600 invoices.

/**
 * Seeds the benchmark co-op's data into co-op `c` (made by lib.mjs makeCoop). Returns whether the
 * batches table exists (older builds had none).
 */
export async function seedBenchCoop(pool, c) {
  console.log('[bench] seeding 300 members, 5 tanks, 50,000 draws…');
  await pool.query(
    `INSERT INTO users (email, name) SELECT 'm' || g || '@overview.bench', 'Member ' || g FROM generate_series(1, 300) g`,
  );
  await pool.query(
    `INSERT INTO memberships (coop_id, user_id, role) SELECT $1, id, 'member' FROM users WHERE email LIKE '%@overview.bench' AND email LIKE 'm%'`,
    [c],
  );
  await pool.query(
    `WITH t AS (INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, value_cents) SELECT $1, 'Tank ' || g, 10000, 5000, 400000 FROM generate_series(1, 5) g
       RETURNING id, coop_id, on_hand_liters)
     INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, on_hand_liters FROM t`,
    [c],
  );
  await pool.query(
    `INSERT INTO price_policies (coop_id, kind, margin_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon) VALUES ($1, 'cost-plus-amount', 40, 10, 24.4)`,
    [c],
  );
  await pool.query(
    `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, occurred_at)
     SELECT $1, t.id, 'release', 150, 12000, 5000, 400000, now() - (g || ' days')::interval
     FROM tanks t, generate_series(1, 400) g WHERE t.coop_id = $1`,
    [c],
  );
  await pool.query(
    `WITH m AS (SELECT array_agg(id) ids FROM memberships WHERE coop_id = $1), t AS (SELECT array_agg(id) ids FROM tanks WHERE coop_id = $1)
     INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, unit_price_cents_per_gallon, fuel_cents, total_cents, occurred_at)
     SELECT $1, t.ids[1 + g % 5], m.ids[1 + g % array_length(m.ids, 1)], 40, (ARRAY['road','off-road','heating'])[1 + g % 3], 360, 3804, 3804,
            now() - ((g % 500) || ' days')::interval
     FROM generate_series(1, 50000) g, m, t`,
    [c],
  );
  const hasBatches = (await pool.query(`SELECT to_regclass('batches') AS t`)).rows[0].t !== null;
  if (hasBatches) {
    console.log(
      '[bench] seeding 2,000 batches (1,900 released, 88 rejected, 6 under way, 6 planned), chemical lots, 3,600 invoices…',
    );
    // status by number: 1..1900 released, 1901..1988 rejected, 1989..1994 washing, 1995..2000 planned.
    await pool.query(
      `INSERT INTO batches (coop_id, number, status, batch_date, oil_liters, titration_trials_ml, titrant, titration_avg_ml, catalyst, base_g_per_l,
         purity_pct, titrant_from, catalyst_rule, methanol_mode, methanol_pct, computed_catalyst_grams, computed_methanol_liters,
         tank_id, released_liters, released_at, rejected_at, reject_reason,
         cost_methanol_cents, cost_catalyst_cents, cost_energy_cents, cost_feedstock_cents, cost_other_cents, total_cost_cents, cost_per_gallon_cents)
       SELECT $1, g, s.status, current_date - (2000 - g) / 3, 200, '[1.5]', 'KOH', 1.5, 'KOH', 3.5, 90, 'same-catalyst', 'bench', 'percent', 20, 1000, 40,
         CASE WHEN s.status = 'released' THEN t.ids[1 + g % 5] END, CASE WHEN s.status = 'released' THEN 190 END,
         CASE WHEN s.status = 'released' THEN now() - ((2000 - g) / 3 || ' days')::interval END,
         CASE WHEN s.status = 'rejected' THEN now() - ((2000 - g) / 3 || ' days')::interval END, CASE WHEN s.status = 'rejected' THEN 'bench' END,
         CASE WHEN s.status = 'released' THEN 6000 END, CASE WHEN s.status = 'released' THEN 900 END, CASE WHEN s.status = 'released' THEN 700 + g % 300 END,
         CASE WHEN s.status = 'released' THEN 1500 END, CASE WHEN s.status = 'released' THEN 200 END,
         CASE WHEN s.status = 'released' THEN 9300 + g % 300 END, CASE WHEN s.status = 'released' THEN round((9300 + g % 300) * 3.785411784 / 190) END
       FROM generate_series(1, 2000) g,
            LATERAL (SELECT CASE WHEN g <= 1900 THEN 'released' WHEN g <= 1988 THEN 'rejected' WHEN g <= 1994 THEN 'washing' ELSE 'planned' END AS status) s,
            (SELECT array_agg(id) ids FROM tanks WHERE coop_id = $1) t`,
      [c],
    );
    await pool.query(
      `INSERT INTO chemical_lots (coop_id, kind, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents, purity_pct)
       VALUES ($1, 'methanol', 'Bench', current_date - 30, 'L', 1000, 400, 150000, NULL), ($1, 'KOH', 'Bench', current_date - 30, 'g', 50000, 20000, 40000, 90)`,
      [c],
    );
    await pool.query(
      `INSERT INTO invoices (coop_id, membership_id, period, number, status, total_cents, paid_cents, issued_at)
       SELECT $1, m.id, (date_trunc('month', current_date) - (k || ' months')::interval)::date, row_number() OVER (), CASE WHEN k < 2 AND m.id % 3 = 0 THEN 'issued' ELSE 'paid' END,
              4000 + m.id % 5000, CASE WHEN k < 2 AND m.id % 3 = 0 THEN 0 ELSE 4000 + m.id % 5000 END, now()
       FROM memberships m, generate_series(0, 11) k WHERE m.coop_id = $1 AND m.role = 'member'`,
      [c],
    );
  }
  return hasBatches;
}
