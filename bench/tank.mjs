#!/usr/bin/env node
// Tank benchmark (on demand; not part of npm test): `node bench/tank.mjs`.
//
// A fresh PostgreSQL cluster (.data/bench/pg, normal durability settings unless BENCH_FAST=1),
// migrations, then a co-op with 300 members, 5 tanks and 50,000 historical draws (each with its
// ledger row, tank totals equal to the ledger). `next start` from the current build (built when
// stale). Then, with autocannon against signed-in members:
//   1. GET /api/health, the bench-only route that runs the tank list's Sequelize query with no
//      session (/api/bench/tank-query, answered only because bench/lib.mjs sets TALLYVAT_BENCH=1)
//      and the tank page's API (/api/coops/:coop/tanks), 10 connections, back to back (twice,
//      alternating) → each one's throughput as a ratio to the bench route, and p97.5;
//   2. POST reservations at 50 connections (several members' sessions, mixed tanks, one tank
//      with only 100 gal available so it runs out mid-run) → reservations/s; then zero oversell
//      is verified in the database;
//   3. POST reservations at 10 connections → p97.5.
// Results print as a table and are saved to bench/output/tank-<timestamp>.json.
import fs from 'node:fs';
import path from 'node:path';
import autocannon from 'autocannon';
import bcrypt from 'bcryptjs';
import { postgresCpuMeter, serverCpuMs, signInCookie, startStack } from './lib.mjs';

const DURATION = Number(process.env.BENCH_SECONDS ?? 10);
const MEMBERS = 300;
const DRAWS = 50_000;
const TANKS = 5;
const SESSIONS = 40; // signed-in members whose cookies the load rotates through
const L_PER_GAL = 3.785411784; // NIST Handbook 44
const log = (...a) => console.log('[bench]', ...a);

let stack; // startStack stops it on Ctrl-C too
const stopAll = async () => stack?.stop();

try {
  stack = await startStack({ name: 'tank', fast: process.env.BENCH_FAST === '1', log });
  const { pool, baseUrl: base } = stack;
  const q = (text, params = []) => pool.query(text, params).then((r) => r.rows);

  log(`seeding ${MEMBERS} members, ${TANKS} tanks, ${DRAWS.toLocaleString()} draws…`);
  const password = 'bench-password-2026';
  const hash = await bcrypt.hash(password, 10);
  const [coop] = await q(
    `INSERT INTO coops (name, slug, units) VALUES ('Bench Fuel Co-op', 'bench-coop', 'us') RETURNING id`,
  );
  const [brewer] = await q(
    `INSERT INTO users (email, name, password_hash) VALUES ('brewer@bench.example.org', 'Bench Brewer', $1) RETURNING id`,
    [hash],
  );
  await q(`INSERT INTO memberships (coop_id, user_id, role) VALUES ($1, $2, 'brewer')`, [coop.id, brewer.id]);
  await q(
    `INSERT INTO users (email, name, password_hash) SELECT 'member' || g || '@bench.example.org', 'Member ' || g, $1 FROM generate_series(1, $2) g`,
    [hash, MEMBERS],
  );
  await q(
    `INSERT INTO memberships (coop_id, user_id, role) SELECT $1, id, 'member' FROM users WHERE email LIKE 'member%@bench.example.org'`,
    [coop.id],
  );
  await q(
    `INSERT INTO price_policies (coop_id, kind, price_cents_per_gallon, road_tax_cents_per_gallon, effective_from) VALUES ($1, 'fixed', 450, 24.4, now() - interval '2 years')`,
    [coop.id],
  );
  // Four roomy tanks and one that holds exactly 100 gal more than its history drew (so it runs out under load).
  for (let i = 1; i <= TANKS; i++) {
    await q(`INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, $2, 1000000)`, [
      coop.id,
      i === TANKS ? 'Tight tank' : `Tank ${i}`,
    ]);
  }
  const tanks = await q(`SELECT id, name FROM tanks WHERE coop_id = $1 ORDER BY id`, [coop.id]);
  const tight = tanks[TANKS - 1];
  // History: 50,000 draws of 2–20 gal at the fixed price, spread over the last year; value out at 300 ¢/gal.
  await q(
    `
    INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, price_policy_id, unit_price_cents_per_gallon,
      road_tax_cents_per_gallon, fuel_cents, tax_cents, total_cents, cost_value_cents, occurred_at, created_at)
    SELECT $1, t.id, m.id, round((g.gal * ${L_PER_GAL})::numeric, 3), CASE WHEN g.n % 3 = 0 THEN 'heating' ELSE 'road' END,
      (SELECT id FROM price_policies WHERE coop_id = $1), 450, CASE WHEN g.n % 3 = 0 THEN 0 ELSE 24.4 END,
      round(450 * g.gal), CASE WHEN g.n % 3 = 0 THEN 0 ELSE round(24.4 * g.gal) END,
      round(450 * g.gal) + CASE WHEN g.n % 3 = 0 THEN 0 ELSE round(24.4 * g.gal) END, round(300 * g.gal),
      now() - (g.n || ' minutes')::interval * 10, now()
    FROM (SELECT n, 2 + (n * 7919 % 181) / 10.0 AS gal FROM generate_series(1, $2) n) g
    JOIN LATERAL (SELECT id FROM tanks WHERE coop_id = $1 ORDER BY id OFFSET (g.n % ${TANKS}) LIMIT 1) t ON true
    JOIN LATERAL (SELECT id FROM memberships WHERE coop_id = $1 AND role = 'member' ORDER BY id OFFSET (g.n % ${MEMBERS}) LIMIT 1) m ON true`,
    [coop.id, DRAWS],
  );
  // Ledger: an opening balance per tank covering its history (+ 5,000 gal, or + 100 gal for the tight one), then one row per draw.
  for (const t of tanks) {
    const [{ drawn, value }] = await q(
      `SELECT coalesce(sum(quantity_liters), 0) AS drawn, coalesce(sum(cost_value_cents), 0) AS value FROM draws WHERE tank_id = $1`,
      [t.id],
    );
    const extraGal = t.id === tight.id ? 100 : 5000;
    const openLiters = (Number(drawn) + Math.round(extraGal * L_PER_GAL * 1000) / 1000).toFixed(3);
    const openValue = Number(value) + Math.round(extraGal * 300);
    await q(
      `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, reason, occurred_at)
             VALUES ($1, $2, 'dip-adjustment', $3, $4, $3, $4, 'Opening balance', now() - interval '13 months')`,
      [coop.id, t.id, openLiters, openValue],
    );
    // Each draw's ledger row with its (unattributed) batch share, in one statement: a draw's shares
    // must sum to its row when the statement commits.
    await q(
      `
      WITH m AS (
        INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, draw_id, occurred_at)
        SELECT d.coop_id, d.tank_id, 'draw', -d.quantity_liters, -d.cost_value_cents,
               $2::numeric - sum(d.quantity_liters) OVER w, $3::bigint - sum(d.cost_value_cents) OVER w, d.id, d.occurred_at
        FROM draws d WHERE d.tank_id = $1 WINDOW w AS (ORDER BY d.occurred_at, d.id)
        RETURNING id, coop_id, tank_id, draw_id, quantity_liters)
      INSERT INTO movement_batch_shares (coop_id, movement_id, tank_id, draw_id, batch_id, quantity_liters)
      SELECT coop_id, id, tank_id, draw_id, NULL, quantity_liters FROM m`,
      [t.id, openLiters, openValue],
    );
    // On hand = the ledger, all of it one unattributed layer (layers must sum to on hand at commit).
    await q(
      `WITH t AS (UPDATE tanks SET on_hand_liters = (SELECT sum(quantity_liters) FROM tank_movements WHERE tank_id = $1),
               value_cents = (SELECT sum(value_cents) FROM tank_movements WHERE tank_id = $1) WHERE id = $1 RETURNING id, coop_id, on_hand_liters)
             INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, on_hand_liters FROM t WHERE on_hand_liters > 0`,
      [t.id],
    );
  }
  // What autovacuum would have done by then: statistics, and the visibility map for index-only scans.
  await q('VACUUM ANALYZE');
  const [{ n: drawCount }] = await q(`SELECT count(*)::int AS n FROM draws WHERE coop_id = $1`, [coop.id]);
  const [{ n: memberCount }] = await q(
    `SELECT count(*)::int AS n FROM memberships WHERE coop_id = $1 AND role = 'member'`,
    [coop.id],
  );
  log(`seeded: ${memberCount} members, ${drawCount} draws, ${tanks.length} tanks`);

  const signIn = (email) => signInCookie(base, email, password);
  const cookies = [];
  for (let i = 1; i <= SESSIONS; i++) cookies.push(await signIn(`member${i}@bench.example.org`));
  log(`${cookies.length} members signed in`);

  // Each run also notes the server's and PostgreSQL's CPU per request (steadier than req/s on a shared machine).
  const run = (opts) =>
    new Promise((resolve, reject) => {
      const [cpu0, pgUsed] = [serverCpuMs(stack.next.pid), postgresCpuMeter(stack.pgClusterDir)];
      autocannon({ duration: DURATION, ...opts }, (e, r) => {
        if (e) return reject(e);
        const per = (ms) => (ms === null ? null : Number((ms / r.requests.total).toFixed(2)));
        const cpu1 = serverCpuMs(stack.next.pid);
        resolve({
          ...r,
          serverCpuMs: per(cpu0 === null || cpu1 === null ? null : cpu1 - cpu0),
          postgresCpuMs: per(pgUsed()),
        });
      });
    });
  const summary = (r) => ({
    rps: Math.round(r.requests.average),
    p50: r.latency.p50,
    p97_5: r.latency.p97_5,
    p99: r.latency.p99,
    total: r.requests.total,
    serverCpuMsPerRequest: r.serverCpuMs,
    postgresCpuMsPerRequest: r.postgresCpuMs,
    errors: r.errors,
    timeouts: r.timeouts,
    status: Object.fromEntries(Object.entries(r.statusCodeStats ?? {}).map(([k, v]) => [k, v.count])),
  });
  const tanksUrl = `${base}/api/coops/bench-coop/tanks`;
  const queryUrl = `${base}/api/bench/tank-query?coop=${coop.id}`;
  const probe = await fetch(queryUrl);
  if (probe.status !== 200)
    throw new Error(`${queryUrl} answered ${probe.status}: is TALLYVAT_BENCH=1 set by bench/lib.mjs?`);
  await run({ url: `${base}/api/health`, connections: 10, duration: 3 });
  await run({ url: queryUrl, connections: 10, duration: 3 });
  await run({ url: tanksUrl, connections: 10, duration: 3, headers: { cookie: cookies[0] } });

  log(`health, bench tank query and tank API, 10 connections, ${DURATION} s each, twice alternating…`);
  const health = [],
    tankQuery = [],
    tankApi = [],
    signedIn = [];
  for (let i = 0; i < 2; i++) {
    health.push(summary(await run({ url: `${base}/api/health`, connections: 10 })));
    tankQuery.push(summary(await run({ url: queryUrl, connections: 10 })));
    tankApi.push(
      summary(await run({ url: tanksUrl, connections: 10, headers: { cookie: cookies[i % cookies.length] } })),
    );
    // Reference: the cheapest signed-in route (session + one query), to separate sign-in cost from the tank query's.
    signedIn.push(
      summary(
        await run({ url: `${base}/api/coops`, connections: 10, headers: { cookie: cookies[i % cookies.length] } }),
      ),
    );
  }
  const avg = (xs, k) => xs.reduce((s, x) => s + x[k], 0) / xs.length;

  const [before] = await q(`SELECT on_hand_liters - reserved_liters AS avail FROM tanks WHERE id = $1`, [tight.id]);
  const today = new Date().toISOString().slice(0, 10);
  const until = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
  const sizes = ['0.25', '0.5', '1', '1.5', '2'];
  let n = 0;
  const reserveRequests = [
    {
      method: 'POST',
      path: '/api/coops/bench-coop/reservations',
      setupRequest: (req) => {
        n += 1;
        const tank = tanks[n % tanks.length];
        return {
          ...req,
          headers: { 'content-type': 'application/json', origin: base, cookie: cookies[n % cookies.length] },
          body: JSON.stringify({
            tankId: tank.id,
            quantity: sizes[n % sizes.length],
            windowStart: today,
            windowEnd: until,
          }),
        };
      },
    },
  ];
  log(`reservations, 50 connections, ${DURATION} s…`);
  const res50 = summary(await run({ url: base, connections: 50, requests: reserveRequests }));
  log(`reservations, 10 connections, ${DURATION} s…`);
  const res10 = summary(await run({ url: base, connections: 10, requests: reserveRequests }));

  // Zero oversell: on every tank reserved = open reservations ≤ on hand = ledger; the tight tank never went past its 100 gal.
  const checks = await q(
    `
    SELECT t.id, t.name, t.on_hand_liters::text AS on_hand, t.reserved_liters::text AS reserved,
      (SELECT coalesce(sum(quantity_liters), 0) FROM reservations r WHERE r.tank_id = t.id AND r.status = 'open')::text AS open_q,
      (SELECT count(*) FROM reservations r WHERE r.tank_id = t.id)::int AS reservations,
      (SELECT sum(quantity_liters) FROM tank_movements m WHERE m.tank_id = t.id)::text AS ledger_q
    FROM tanks t WHERE t.coop_id = $1 ORDER BY t.id`,
    [coop.id],
  );
  const oversold = checks.filter(
    (c) => Number(c.reserved) > Number(c.on_hand) || c.reserved !== c.open_q || c.on_hand !== c.ledger_q,
  );
  const tightRow = checks.find((c) => c.id === tight.id);
  const tightOk = Number(tightRow.reserved) <= Number(before.avail);

  const result = {
    at: new Date().toISOString(),
    durationSeconds: DURATION,
    fast: process.env.BENCH_FAST === '1',
    data: { members: memberCount, draws: drawCount, tanks: tanks.length, sessions: cookies.length },
    health: { runs: health, rps: Math.round(avg(health, 'rps')), p97_5: avg(health, 'p97_5') },
    tankApi: { runs: tankApi, rps: Math.round(avg(tankApi, 'rps')), p97_5: avg(tankApi, 'p97_5') },
    signedInReference: { runs: signedIn, rps: Math.round(avg(signedIn, 'rps')), p97_5: avg(signedIn, 'p97_5') },
    benchTankQuery: { runs: tankQuery, rps: Math.round(avg(tankQuery, 'rps')), p97_5: avg(tankQuery, 'p97_5') },
    tankVsHealth: Number((avg(tankApi, 'rps') / avg(health, 'rps')).toFixed(3)),
    tankVsBenchQuery: Number((avg(tankApi, 'rps') / avg(tankQuery, 'rps')).toFixed(3)),
    tankVsSignedInReference: Number((avg(tankApi, 'rps') / avg(signedIn, 'rps')).toFixed(3)),
    reservations50: res50,
    reservations10: res10,
    oversell: {
      violations: oversold,
      tightTankAvailableBeforeLiters: Number(before.avail),
      tightTankReservedLiters: Number(tightRow.reserved),
      ok: oversold.length === 0 && tightOk,
    },
    tanks: checks,
  };
  fs.mkdirSync(path.resolve('bench', 'output'), { recursive: true });
  const out = path.resolve('bench', 'output', `tank-${result.at.replace(/[:.]/g, '-')}.json`);
  fs.writeFileSync(out, JSON.stringify(result, null, 2));

  const cpu = (r) => ({
    'server CPU ms/req': r.serverCpuMsPerRequest,
    'PostgreSQL CPU ms/req': r.postgresCpuMsPerRequest,
  });
  // Every row's throughput as a ratio to the bench route (the same tank query, no session), same run.
  const ratio = (rps) => Number((rps / result.benchTankQuery.rps).toFixed(3));
  console.table({
    'GET /api/health (10 conn)': {
      'req/s': result.health.rps,
      '÷ bench query': ratio(result.health.rps),
      'p97.5 ms': result.health.p97_5,
      ...cpu(health[1]),
      status: JSON.stringify(health[0].status),
    },
    'GET bench tank query, no session (10 conn)': {
      'req/s': result.benchTankQuery.rps,
      '÷ bench query': 1,
      'p97.5 ms': result.benchTankQuery.p97_5,
      ...cpu(tankQuery[1]),
      status: JSON.stringify(tankQuery[0].status),
    },
    'GET tanks API (10 conn)': {
      'req/s': result.tankApi.rps,
      '÷ bench query': ratio(result.tankApi.rps),
      'p97.5 ms': result.tankApi.p97_5,
      ...cpu(tankApi[1]),
      status: JSON.stringify(tankApi[0].status),
    },
    'GET /api/coops, signed in (10 conn)': {
      'req/s': result.signedInReference.rps,
      '÷ bench query': ratio(result.signedInReference.rps),
      'p97.5 ms': result.signedInReference.p97_5,
      ...cpu(signedIn[1]),
      status: JSON.stringify(signedIn[0].status),
    },
    'POST reservations (50 conn)': {
      'req/s': res50.rps,
      '÷ bench query': ratio(res50.rps),
      'p97.5 ms': res50.p97_5,
      ...cpu(res50),
      status: JSON.stringify(res50.status),
    },
    'POST reservations (10 conn)': {
      'req/s': res10.rps,
      '÷ bench query': ratio(res10.rps),
      'p97.5 ms': res10.p97_5,
      ...cpu(res10),
      status: JSON.stringify(res10.status),
    },
  });
  log(
    `tank API / bench tank query throughput: ${(result.tankVsBenchQuery * 100).toFixed(1)} %; tank API / health: ${(result.tankVsHealth * 100).toFixed(1)} %; tank API / signed-in reference: ${(result.tankVsSignedInReference * 100).toFixed(1)} %`,
  );
  log(
    `oversell check: ${result.oversell.ok ? 'none' : 'VIOLATION'} (tight tank: ${result.oversell.tightTankReservedLiters} L reserved of ${result.oversell.tightTankAvailableBeforeLiters} L available)`,
  );
  log(`saved ${path.relative(process.cwd(), out)}`);
  await stopAll();
  process.exit(result.oversell.ok ? 0 : 1);
} catch (e) {
  console.error(e);
  await stopAll();
  process.exit(1);
}
