// Overview API on the benchmark co-op: 300 members, 50,000 draws, 5 tanks (and 2,000 batches
// when the batches table exists). Target: p97.5 under 80 ms at 10 connections.
import { load, makeCoop, report, signInCookie, startStack } from './lib.mjs';

const stack = await startStack({ name: 'overview' });
try {
  const { pool, baseUrl } = stack;
  const coop = await makeCoop(pool, 'overview-bench');
  const c = coop.coopId;
  console.log('[bench] seeding 300 members, 5 tanks, 50,000 draws…');
  await pool.query(
    `INSERT INTO users (email, name) SELECT 'm' || g || '@overview.bench', 'Member ' || g FROM generate_series(1, 300) g`);
  await pool.query(
    `INSERT INTO memberships (coop_id, user_id, role) SELECT $1, id, 'member' FROM users WHERE email LIKE '%@overview.bench' AND email LIKE 'm%'`, [c]);
  await pool.query(
    `INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, value_cents) SELECT $1, 'Tank ' || g, 10000, 5000, 400000 FROM generate_series(1, 5) g`, [c]);
  await pool.query(
    `INSERT INTO price_policies (coop_id, kind, margin_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon) VALUES ($1, 'cost-plus-amount', 40, 10, 24.4)`, [c]);
  await pool.query(
    `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, occurred_at)
     SELECT $1, t.id, 'release', 150, 12000, 5000, 400000, now() - (g || ' days')::interval
     FROM tanks t, generate_series(1, 400) g WHERE t.coop_id = $1`, [c]);
  await pool.query(
    `WITH m AS (SELECT array_agg(id) ids FROM memberships WHERE coop_id = $1), t AS (SELECT array_agg(id) ids FROM tanks WHERE coop_id = $1)
     INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, unit_price_cents_per_gallon, fuel_cents, total_cents, occurred_at)
     SELECT $1, t.ids[1 + g % 5], m.ids[1 + g % array_length(m.ids, 1)], 40, (ARRAY['road','off-road','heating'])[1 + g % 3], 360, 3804, 3804,
            now() - ((g % 500) || ' days')::interval
     FROM generate_series(1, 50000) g, m, t`, [c]);
  const hasBatches = (await pool.query(`SELECT to_regclass('batches') AS t`)).rows[0].t !== null;
  await pool.query('ANALYZE');
  const cookie = await signInCookie(baseUrl, coop.people.admin.email);
  const headers = { cookie };
  await load({ url: `${baseUrl}/api/coops/${coop.slug}/overview`, headers, duration: 2 });
  const health = report('/api/health (10 conn)', await load({ url: `${baseUrl}/api/health` }));
  const overview = report('overview API, admin (10 conn)', await load({ url: `${baseUrl}/api/coops/${coop.slug}/overview`, headers }), health);
  console.log(`target p97.5 < 80 ms: ${overview.p97_5 < 80 ? 'met' : 'NOT met'}${hasBatches ? '' : ' (no batches table in this build)'}`);
} finally {
  await stack.stop();
}
