#!/usr/bin/env node
// Mixed traffic (on demand; not part of npm test): `npm run bench -- mixed` or
// `node bench/mixed.mjs [--seconds=180] [--connections=20] [--only=one|two]`.
//
// The benchmark co-op (bench/seed.mjs: 300 members, 50,000 draws, 2,000 batches, 3,600 invoices),
// then autocannon at 20 connections for 180 s (BENCH_SECONDS / --seconds) of the traffic a busy
// co-op makes: each connection repeats
//   GET tanks (member) · GET batch list (brewer) · GET overview (admin) · POST reservation (1 gal) ·
//   GET tanks · GET batch list · GET overview · POST cancel (the reservation it made; a GET tanks
//   when the reservation was refused)
// — 6 reads to 2 writes — first against one `next start`, then against two instances (same
// database) behind a small round-robin proxy (bench/lib.mjs roundRobinProxy). Reports p50,
// p97.5 and p99 latency, requests/s, errors (socket errors, timeouts, 5xx), the status counts,
// each instance's peak resident memory and the peak number of PostgreSQL connections.
// Budget on a 2-core machine: 0 errors and p97.5 < 250 ms for one instance.
// Results print as a table and are saved to bench/output/mixed-<timestamp>.json.
import fs from 'node:fs';
import path from 'node:path';
import autocannon from 'autocannon';
import { makeCoop, postgresCpuMeter, roundRobinProxy, rssMiB, serverCpuMs, signInCookie, startStack } from './lib.mjs';
import { seedBenchCoop } from './seed.mjs';

const arg = (name) => process.argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1];
const SECONDS = Number(arg('seconds') ?? process.env.BENCH_SECONDS ?? 180);
const CONNECTIONS = Number(arg('connections') ?? process.env.BENCH_CONNECTIONS ?? 20);
const ONLY = arg('only');
const BUDGET_P97_5_MS = 250;
const log = (...a) => console.log('[bench]', ...a);

const stack = await startStack({ name: 'mixed', log });
let proxy = null;
try {
  const { pool, baseUrl } = stack;
  const coop = await makeCoop(pool, 'mixed-bench');
  await seedBenchCoop(pool, coop.coopId);
  await pool.query('VACUUM ANALYZE');
  const [tank] = (await pool.query(`SELECT id FROM tanks WHERE coop_id = $1 ORDER BY id LIMIT 1`, [coop.coopId])).rows;
  // Sessions are rows in PostgreSQL: a cookie made on one instance works on every other.
  const cookie = {};
  for (const role of ['admin', 'brewer', 'member']) cookie[role] = await signInCookie(baseUrl, coop.people[role].email);
  const api = `/api/coops/${coop.slug}`;
  const today = new Date().toISOString().slice(0, 10);
  const until = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);

  /** The request sequence each connection repeats (autocannon keeps `context` per connection). */
  const sequence = (origin) => {
    const get = (p, role) => ({ method: 'GET', path: `${api}${p}`, headers: { cookie: cookie[role] } });
    const json = { 'content-type': 'application/json', origin };
    return [
      get('/tanks', 'member'),
      get('/batches', 'brewer'),
      get('/overview', 'admin'),
      {
        method: 'POST',
        path: `${api}/reservations`,
        headers: { ...json, cookie: cookie.member },
        body: JSON.stringify({ tankId: tank.id, quantity: '1', windowStart: today, windowEnd: until }),
        onResponse: (status, body, context) => {
          context.reservationId = status === 201 ? JSON.parse(body).id : null;
        },
      },
      get('/tanks', 'member'),
      get('/batches', 'brewer'),
      get('/overview', 'admin'),
      {
        method: 'POST',
        path: `${api}/reservations/0/cancel`,
        headers: { ...json, cookie: cookie.member },
        body: '{}',
        setupRequest: (req, context) =>
          context.reservationId
            ? { ...req, path: `${api}/reservations/${context.reservationId}/cancel` }
            : { method: 'GET', path: `${api}/tanks`, headers: { cookie: cookie.member } },
      },
    ];
  };

  /** Samples memory of the given processes and PostgreSQL's connection count every second. */
  const sampler = (pids) => {
    const peak = { rssMiB: Object.fromEntries(pids.map((p) => [p, 0])), dbConnections: 0 };
    const timer = setInterval(async () => {
      for (const p of pids) peak.rssMiB[p] = Math.max(peak.rssMiB[p], rssMiB(p) ?? 0);
      try {
        const [r] = (
          await pool.query(
            `SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()`,
          )
        ).rows;
        peak.dbConnections = Math.max(peak.dbConnections, r.n);
      } catch {
        /* a sample lost under load */
      }
    }, 1_000);
    return () => (clearInterval(timer), peak);
  };

  const run = async (label, url, pids) => {
    log(`${label}: ${CONNECTIONS} connections for ${SECONDS} s…`);
    // Warm-up: every route compiled and cached once, so the run measures steady traffic.
    await autocannon({ url, connections: 4, duration: 3, requests: sequence(url) });
    const cpu0 = pids.map((p) => serverCpuMs(p));
    const pgUsed = postgresCpuMeter(stack.pgClusterDir);
    const stop = sampler(pids);
    const r = await autocannon({
      url,
      connections: CONNECTIONS,
      duration: SECONDS,
      requests: sequence(url),
      timeout: 30,
    });
    const peak = stop();
    const status = Object.fromEntries(Object.entries(r.statusCodeStats ?? {}).map(([k, v]) => [k, v.count]));
    const fiveXX = Object.entries(status)
      .filter(([k]) => Number(k) >= 500)
      .reduce((s, [, n]) => s + n, 0);
    const cpu = pids.reduce((s, p, i) => s + ((serverCpuMs(p) ?? 0) - (cpu0[i] ?? 0)), 0);
    return {
      label,
      rps: Math.round(r.requests.average),
      total: r.requests.total,
      p50: r.latency.p50,
      p97_5: r.latency.p97_5,
      p99: r.latency.p99,
      max: r.latency.max,
      errors: r.errors + r.timeouts + fiveXX,
      socketErrors: r.errors,
      timeouts: r.timeouts,
      status,
      serverCpuMsPerRequest: Number((cpu / r.requests.total).toFixed(2)),
      postgresCpuMsPerRequest: Number(((pgUsed() ?? 0) / r.requests.total).toFixed(2)),
      peakRssMiB: Object.values(peak.rssMiB),
      peakDbConnections: peak.dbConnections,
    };
  };

  const results = [];
  if (ONLY !== 'two') results.push(await run('one instance', baseUrl, [stack.next.pid]));
  if (ONLY !== 'one') {
    const second = await stack.startInstance();
    proxy = await roundRobinProxy([baseUrl, second.baseUrl]);
    results.push(await run('two instances, round-robin proxy', proxy.baseUrl, [stack.next.pid, second.child.pid]));
  }

  // The reservations and cancels left the tank consistent: reserved = open reservations ≤ on hand.
  const [t] = (
    await pool.query(
      `SELECT t.on_hand_liters::text AS on_hand, t.reserved_liters::text AS reserved,
            (SELECT coalesce(sum(quantity_liters), 0) FROM reservations r WHERE r.tank_id = t.id AND r.status = 'open')::text AS open_q
       FROM tanks t WHERE t.id = $1`,
      [tank.id],
    )
  ).rows;
  const consistent = Number(t.reserved) === Number(t.open_q) && Number(t.reserved) <= Number(t.on_hand);

  const out = {
    at: new Date().toISOString(),
    seconds: SECONDS,
    connections: CONNECTIONS,
    mix: 'per 8 requests: 2 GET tanks, 2 GET batch list, 2 GET overview, 1 POST reservation, 1 POST cancel (a GET tanks when the reservation was refused)',
    results,
    tank: { ...t, consistent },
  };
  fs.mkdirSync(path.resolve('bench', 'output'), { recursive: true });
  const file = path.resolve('bench', 'output', `mixed-${out.at.replace(/[:.]/g, '-')}.json`);
  fs.writeFileSync(file, JSON.stringify(out, null, 2));
  console.table(
    Object.fromEntries(
      results.map((r) => [
        r.label,
        {
          'req/s': r.rps,
          'p50 ms': r.p50,
          'p97.5 ms': r.p97_5,
          'p99 ms': r.p99,
          errors: r.errors,
          'server CPU ms/req': r.serverCpuMsPerRequest,
          'PG CPU ms/req': r.postgresCpuMsPerRequest,
          'peak RSS MiB': r.peakRssMiB.join(' + '),
          'peak DB conns': r.peakDbConnections,
          status: JSON.stringify(r.status),
        },
      ]),
    ),
  );
  const one = results.find((r) => r.label === 'one instance');
  if (one)
    log(
      `budget (one instance: 0 errors, p97.5 < ${BUDGET_P97_5_MS} ms): ${one.errors === 0 && one.p97_5 < BUDGET_P97_5_MS ? 'met' : 'NOT met'}`,
    );
  log(
    `tank after the run: reserved ${t.reserved} L = open ${t.open_q} L, on hand ${t.on_hand} L: ${consistent ? 'consistent' : 'INCONSISTENT'}`,
  );
  log(`saved ${path.relative(process.cwd(), file)}`);
  await proxy?.stop();
  await stack.stop();
  process.exit(consistent && results.every((r) => r.errors === 0) ? 0 : 1);
} catch (e) {
  console.error(e);
  await proxy?.stop();
  await stack.stop();
  process.exit(1);
}
