#!/usr/bin/env node
// Brewing load benchmark (run on demand: `node bench/brewing.mjs`; not part of npm test).
//
// Seeds one co-op with 2,000 batches and 5,000 chemical lots in a throw-away PostgreSQL cluster
// (.data/bench), starts the production build with `next start`, signs in as a brewer and runs
// autocannon at 10 connections against /api/health (a minimal handler with one query), the
// batch list API and the planner route, in the same run. Prints req/s, p97.5 latency and the
// ratio to /api/health, and writes bench/output/brewing.json.
//
// Targets (issue 4): batch list ≥ 70 % of /api/health's throughput with p97.5 < 60 ms; the
// planner p97.5 < 60 ms. Options: DURATION=seconds per run (5), ROUNDS (3), CONNECTIONS (10),
// ONLY=<part of an endpoint name> to measure one endpoint (with /api/health), PROFILE=1.
import fs from 'node:fs';
import path from 'node:path';
import autocannon from 'autocannon';
import bcrypt from 'bcryptjs';
import { postgresCpuMeter, serverCpuMs, signInCookie, startStack } from './lib.mjs';

const DURATION = Number(process.env.DURATION ?? 5);
const ROUNDS = Number(process.env.ROUNDS ?? 3);
const CONNECTIONS = Number(process.env.CONNECTIONS ?? 10);
const BATCHES = 2000;
const LOTS = 5000;
const SLUG = 'bench-brewing';
const EMAIL = 'bench.brewer@example.org';
const PASSWORD = 'bench-brewing-password-2026';
const log = (...a) => console.log('[bench]', ...a);

let stack; // startStack stops it on Ctrl-C too
const stopAll = async () => stack?.stop();

try {
  // PROFILE=1 writes a CPU profile of the server to .data/bench-profile (open it in Chrome DevTools).
  if (process.env.PROFILE) process.env.BENCH_CPU_PROF ??= path.resolve('.data', 'bench-profile');
  log('migrating and seeding the demo data…');
  stack = await startStack({ name: 'brewing', seed: true, log });
  const base = stack.baseUrl;

  log(`seeding ${BATCHES} batches and ${LOTS} chemical lots in one co-op…`);
  const client = stack.pool;
  const one = async (sql, params) => (await client.query(sql, params)).rows[0];
  const coop = await one(
    `INSERT INTO coops (name, slug, units, settings) VALUES ('Bench Brewing Co-op', $1, 'us', $2) RETURNING id`,
    [SLUG, JSON.stringify({ recipe: { catalyst: 'KOH', baseGramsPerLiter: 4.91, purityPct: 90, methanolPct: 20 } })],
  );
  const user = await one(
    `INSERT INTO users (email, name, password_hash) VALUES ($1, 'Bench Brewer', $2) RETURNING id`,
    [EMAIL, bcrypt.hashSync(PASSWORD, 10)],
  );
  await client.query(`INSERT INTO memberships (coop_id, user_id, role) VALUES ($1, $2, 'brewer')`, [coop.id, user.id]);
  const tank = await one(
    `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Bench tank', 100000) RETURNING id`,
    [coop.id],
  );
  // Lots over ten years, three kinds in turn; all but the newest 150 used up (as in a co-op's real history).
  await client.query(
    `INSERT INTO chemical_lots (coop_id, kind, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents, purity_pct)
     SELECT $1, k.kind, 'Bench Supply ' || (g % 7), date '2016-01-01' + (g * 3650 / $2), k.unit, k.qty,
            CASE WHEN g > $2 - 150 THEN k.qty ELSE 0 END, k.cost, k.purity
       FROM generate_series(1, $2) g,
            LATERAL (SELECT CASE g % 3 WHEN 0 THEN 'methanol' WHEN 1 THEN 'KOH' ELSE 'NaOH' END AS kind) kk,
            LATERAL (SELECT kk.kind,
                            CASE kk.kind WHEN 'methanol' THEN 'L' ELSE 'g' END AS unit,
                            CASE kk.kind WHEN 'methanol' THEN 208.198 ELSE 22680 END AS qty,
                            CASE kk.kind WHEN 'methanol' THEN 34900 + g % 500 ELSE 11800 + g % 300 END AS cost,
                            CASE kk.kind WHEN 'methanol' THEN NULL ELSE 90 END AS purity) k`,
    [coop.id, LOTS],
  );
  const common = `catalyst, base_g_per_l, purity_pct, titrant_from, catalyst_rule, methanol_mode, methanol_pct, titration_trials_ml, titrant, titration_avg_ml,
    computed_catalyst_grams, computed_methanol_liters`;
  const commonValues = `'KOH', 4.91, 90, 'same-catalyst', 'base-over-purity-plus-titration', 'percent', 20, '[3.1,3.2,3.3]'::jsonb, 'KOH', 3.2,
    (4.91 / 0.9 + 3.2) * (140 + g % 40), (140 + g % 40) * 0.2`;
  await client.query(
    `INSERT INTO batches (coop_id, number, status, batch_date, oil_liters, ${common}, quick_tests, quality_verdict, screening_verdict,
       tank_id, released_liters, released_at, cost_methanol_cents, cost_catalyst_cents, cost_energy_cents, cost_feedstock_cents, cost_other_cents,
       total_cost_cents, cost_per_gallon_cents)
     SELECT $1, g, 'released', date '2016-01-01' + g * 1.8 * interval '1 day', 140 + g % 40, ${commonValues},
            '{"test327":{"result":"clear"},"washTest":"clean-split","water":"clear"}'::jsonb, CASE WHEN g % 5 = 0 THEN 'pass' ELSE 'incomplete' END, 'incomplete',
            $2, 130 + g % 40, date '2016-01-06' + g * 1.8 * interval '1 day', 4000 + g % 300, 900 + g % 90, 70, 0, 400,
            4000 + g % 300 + 900 + g % 90 + 70 + 400, round((4000 + g % 300 + 900 + g % 90 + 70 + 400) / ((130 + g % 40) / 3.785411784))
       FROM generate_series(1, $3) g`,
    [coop.id, tank.id, BATCHES - 10],
  );
  await client.query(
    `INSERT INTO batches (coop_id, number, status, batch_date, oil_liters, ${common})
     SELECT $1, g, CASE WHEN g > $2 - 5 THEN 'planned' ELSE 'washing' END, date '2026-11-01' + (g - $2), 140 + g % 40, ${commonValues}
       FROM generate_series($2 - 9, $2) g`,
    [coop.id, BATCHES],
  );
  // What autovacuum would have done by the time a co-op has this history: statistics, and the visibility map
  // that lets counts use index-only scans.
  await client.query('VACUUM ANALYZE');
  const counts = await one(
    `SELECT (SELECT count(*) FROM batches WHERE coop_id = $1) AS batches, (SELECT count(*) FROM chemical_lots WHERE coop_id = $1) AS lots`,
    [coop.id],
  );
  log(`co-op ${SLUG}: ${counts.batches} batches, ${counts.lots} chemical lots`);

  // Sign in like a browser: CSRF token, then the credentials callback.
  const session = await signInCookie(base, EMAIL, PASSWORD);
  const cookie = () => session;
  const check = await fetch(`${base}/api/coops/${SLUG}/batches?pageSize=25`, { headers: { cookie: cookie() } });
  if (!check.ok) throw new Error(`signed-in batch list answered ${check.status}`);
  const listBody = await check.json();
  log(`signed in; first page holds ${listBody.rows.length} of ${listBody.total} batches`);
  const plannerBody = JSON.stringify({ oilVolume: 40, titrationTrials: [3.1, 3.2, 3.3], tariffCentsPerKwh: 14 });
  const planCheck = await fetch(`${base}/api/coops/${SLUG}/planner`, {
    method: 'POST',
    headers: { cookie: cookie(), origin: base, 'content-type': 'application/json' },
    body: plannerBody,
  });
  if (!planCheck.ok) throw new Error(`planner answered ${planCheck.status}: ${await planCheck.text()}`);

  const run = (name, opts, duration) =>
    new Promise((resolve, reject) => {
      const cpu0 = serverCpuMs(stack.next.pid);
      const pgUsed = postgresCpuMeter(stack.pgClusterDir);
      autocannon({ connections: CONNECTIONS, duration, ...opts }, (err, r) => {
        if (err) return reject(err);
        const cpu = cpu0 === null ? null : (serverCpuMs(stack.next.pid) - cpu0) / r.requests.total;
        const pgMs = pgUsed();
        const pgCpu = pgMs === null ? null : pgMs / r.requests.total;
        resolve({
          name,
          reqPerSec: r.requests.average,
          p50: r.latency.p50,
          p97_5: r.latency.p97_5,
          p99: r.latency.p99,
          requests: r.requests.total,
          failures: r.non2xx + r.errors + r.timeouts,
          cpuMsPerRequest: cpu,
          pgCpuMsPerRequest: pgCpu,
        });
      });
    });
  const targets = [
    ['GET /api/health', { url: `${base}/api/health` }],
    // The tank list's Sequelize query with no session (bench-only route): the reference each API is measured against.
    ['GET /api/bench/tank-query (no session)', { url: `${base}/api/bench/tank-query?coop=${SLUG}` }],
    [
      'GET /api/coops (signed in, 1 query: the session check alone)',
      { url: `${base}/api/coops`, headers: { cookie: cookie() } },
    ],
    [
      'GET batch list (page 1 of 2,000, 25 rows)',
      { url: `${base}/api/coops/${SLUG}/batches?pageSize=25`, headers: { cookie: cookie() } },
    ],
    [
      'GET batch list (sorted by cost, page 40)',
      {
        url: `${base}/api/coops/${SLUG}/batches?pageSize=25&sort=costPerGallon&dir=asc&page=40`,
        headers: { cookie: cookie() },
      },
    ],
    [
      'POST planner',
      {
        url: `${base}/api/coops/${SLUG}/planner`,
        method: 'POST',
        headers: { cookie: cookie(), origin: base, 'content-type': 'application/json' },
        body: plannerBody,
      },
    ],
  ].filter(([name], i) => i <= 1 || !process.env.ONLY || name.includes(process.env.ONLY));
  log('warming up…');
  for (const [name, opts] of targets) await run(name, opts, 3);
  // The machine is shared, so throughput drifts: run the endpoints in interleaved rounds and
  // report medians; each round's ratio to /api/health is taken within that round.
  const rounds = [];
  for (let i = 0; i < ROUNDS; i++) {
    log(`round ${i + 1} of ${ROUNDS}: ${DURATION} s per endpoint at ${CONNECTIONS} connections…`);
    const round = [];
    for (const [name, opts] of targets) round.push(await run(name, opts, DURATION));
    rounds.push(round);
  }
  const median = (xs) => {
    const s = [...xs].sort((a, b) => a - b);
    const m = Math.floor(s.length / 2);
    return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
  };
  const results = targets.map(([name], j) => {
    const runs = rounds.map((r) => r[j]);
    return {
      name,
      reqPerSec: median(runs.map((r) => r.reqPerSec)),
      p50: median(runs.map((r) => r.p50)),
      p97_5: median(runs.map((r) => r.p97_5)),
      p99: median(runs.map((r) => r.p99)),
      ratioToHealth: median(rounds.map((r) => r[j].reqPerSec / r[0].reqPerSec)),
      ratioToBenchQuery: median(rounds.map((r) => r[j].reqPerSec / r[1].reqPerSec)),
      // Server CPU per request, and /api/health's over this endpoint's (the throughput ratio the server's CPU alone would give).
      cpuMsPerRequest: runs[0].cpuMsPerRequest === null ? null : median(runs.map((r) => r.cpuMsPerRequest)),
      cpuRatioToHealth:
        runs[0].cpuMsPerRequest === null
          ? null
          : median(rounds.map((r) => r[0].cpuMsPerRequest / r[j].cpuMsPerRequest)),
      pgCpuMsPerRequest: runs[0].pgCpuMsPerRequest === null ? null : median(runs.map((r) => r.pgCpuMsPerRequest)),
      failures: runs.reduce((a, r) => a + r.failures, 0),
      rounds: runs.map((r) => ({
        reqPerSec: r.reqPerSec,
        p97_5: r.p97_5,
        cpuMsPerRequest: r.cpuMsPerRequest,
        pgCpuMsPerRequest: r.pgCpuMsPerRequest,
      })),
    };
  });
  console.log(`\nmedians of ${ROUNDS} interleaved rounds, ${CONNECTIONS} connections, ${DURATION} s each`);
  console.log(
    '| endpoint | req/s | p50 ms | p97.5 ms | p99 ms | vs bench query | vs /api/health | server CPU ms/req | CPU: health ÷ this | PostgreSQL CPU ms/req | failures |\n|---|---|---|---|---|---|---|---|---|---|---|',
  );
  const pct = (x) => (x === null ? '–' : `${(x * 100).toFixed(0)} %`);
  for (const r of results) {
    console.log(
      `| ${r.name} | ${r.reqPerSec.toFixed(0)} | ${r.p50} | ${r.p97_5} | ${r.p99} | ${pct(r.ratioToBenchQuery)} | ${pct(r.ratioToHealth)} | ${r.cpuMsPerRequest?.toFixed(2) ?? '–'} | ${pct(r.cpuRatioToHealth)} | ${r.pgCpuMsPerRequest?.toFixed(2) ?? '–'} | ${r.failures} |`,
    );
  }
  const list = results.find((r) => r.name.startsWith('GET batch list (page 1'));
  const planner = results.find((r) => r.name === 'POST planner');
  if (list)
    console.log(
      `\nbatch list: ${(list.ratioToHealth * 100).toFixed(0)} % of /api/health (target ≥ 70 %), p97.5 ${list.p97_5} ms (target < 60 ms)`,
    );
  if (planner) console.log(`planner: p97.5 ${planner.p97_5} ms (target < 60 ms)`);
  fs.mkdirSync(path.resolve('bench', 'output'), { recursive: true });
  fs.writeFileSync(
    path.resolve('bench', 'output', 'brewing.json'),
    JSON.stringify(
      { at: new Date().toISOString(), connections: CONNECTIONS, duration: DURATION, rounds: ROUNDS, results },
      null,
      2,
    ),
  );
} catch (e) {
  console.error('[bench] failed:', e);
  process.exitCode = 1;
} finally {
  await stopAll();
}
