import { makeCoop, startStack } from './lib.mjs';
const stack = await startStack({ name: 'explain' });
const { pool } = stack;
const coop = await makeCoop(pool, 'ex');
const c = coop.coopId;
await pool.query(`INSERT INTO users (email, name) SELECT 'm' || g || '@ex.bench', 'Member ' || g FROM generate_series(1, 300) g`);
await pool.query(`INSERT INTO memberships (coop_id, user_id, role) SELECT $1, id, 'member' FROM users WHERE email LIKE '%@ex.bench'`, [c]);
await pool.query(`INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, value_cents) SELECT $1, 'Tank ' || g, 10000, 5000, 400000 FROM generate_series(1, 5) g`, [c]);
await pool.query(`INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, occurred_at)
     SELECT $1, t.id, 'release', 150, 12000, 5000, 400000, now() - (g || ' days')::interval FROM tanks t, generate_series(1, 400) g WHERE t.coop_id = $1`, [c]);
await pool.query(`WITH m AS (SELECT array_agg(id) ids FROM memberships WHERE coop_id = $1), t AS (SELECT array_agg(id) ids FROM tanks WHERE coop_id = $1)
     INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, unit_price_cents_per_gallon, fuel_cents, total_cents, occurred_at)
     SELECT $1, t.ids[1 + g % 5], m.ids[1 + g % array_length(m.ids, 1)], 40, 'road', 360, 3804, 3804, now() - ((g % 500) || ' days')::interval
     FROM generate_series(1, 50000) g, m, t`, [c]);
await pool.query('ANALYZE');
const tz = 'America/Chicago';
const qs = {
 volumes: `WITH months AS (SELECT generate_series(date_trunc('month', now() AT TIME ZONE '${tz}') - interval '11 months', date_trunc('month', now() AT TIME ZONE '${tz}'), interval '1 month') AS m), since AS (SELECT (MIN(m) AT TIME ZONE '${tz}') AS lo FROM months),
       rel AS (SELECT date_trunc('month', t.occurred_at AT TIME ZONE '${tz}') AS m, SUM(t.quantity_liters) AS q FROM tank_movements t, since WHERE t.coop_id = ${c} AND t.kind = 'release' AND t.occurred_at >= since.lo GROUP BY 1),
       dr AS (SELECT date_trunc('month', d.occurred_at AT TIME ZONE '${tz}') AS m, SUM(d.quantity_liters) AS q FROM draws d, since WHERE d.coop_id = ${c} AND d.occurred_at >= since.lo GROUP BY 1)
       SELECT to_char(months.m, 'YYYY-MM') AS month, COALESCE(rel.q, 0) AS released, COALESCE(dr.q, 0) AS drawn FROM months LEFT JOIN rel ON rel.m = months.m LEFT JOIN dr ON dr.m = months.m ORDER BY months.m`,
 level: `WITH days AS (SELECT generate_series((now() AT TIME ZONE '${tz}')::date - 89, (now() AT TIME ZONE '${tz}')::date, interval '1 day')::date AS d)
       SELECT to_char(days.d, 'YYYY-MM-DD') AS day, COALESCE(SUM(x.on_hand_after_liters), 0) AS on_hand FROM days CROSS JOIN tanks t
       LEFT JOIN LATERAL (SELECT m.on_hand_after_liters FROM tank_movements m WHERE m.coop_id = ${c} AND m.tank_id = t.id AND m.occurred_at < ((days.d + 1)::timestamp AT TIME ZONE '${tz}') ORDER BY m.occurred_at DESC, m.id DESC LIMIT 1) x ON true
       WHERE t.coop_id = ${c} AND t.active GROUP BY days.d ORDER BY days.d`,
};
for (const [k, sql] of Object.entries(qs)) {
  const r = await pool.query('EXPLAIN ANALYZE ' + sql);
  console.log(k, r.rows.slice(-2).map((x) => x['QUERY PLAN']).join(' | '));
}
await stack.stop();
