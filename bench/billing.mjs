#!/usr/bin/env node
// On-demand benchmark of the monthly billing run (not part of npm test):
//   node bench/billing.mjs [members=10000] [drawsPerMember=10]
// Starts its own PostgreSQL (.data/bench/pg, normal durability settings) and `next start` from
// the production build, loads one co-op with N members × D draws in last month, then through
// the real API as its treasurer:
//   1. the month run (POST runs → poll until completed): drafts for every member, set-based SQL in chunks;
//   2. invoice PDFs: 50 drafts rendered one after another (server-timing render time and request time);
//   3. issuing every draft (numbers, credit, due dates) in one transaction.
// Reports wall times and the peak resident memory of the Next server and the job worker that
// runs the month (their process trees, sampled
// every 100 ms). E-mails go to a closed port so sending fails fast and stays out of the figures.
import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { createRequire } from 'node:module';
import { startEmbeddedPg, freePort } from '../scripts/lib/pg.mjs';
import { migrate } from '../scripts/lib/db-setup.mjs';
import { buildIfNeeded } from '../scripts/lib/build.mjs';
import { dbPool } from './lib.mjs';
import { startPaymentsFake } from '../scripts/lib/fakes.mjs';
import { startWorkerProcess } from '../scripts/lib/worker-process.mjs';

const require = createRequire(import.meta.url);
const bcrypt = require('bcryptjs');

const MEMBERS = Number(process.argv[2] ?? 10_000);
const DRAWS = Number(process.argv[3] ?? 10);
const PASSWORD = 'bench-password-2026';
const root = path.resolve('.data', 'bench');
const log = (...a) => console.log('[bench]', ...a);

fs.rmSync(root, { recursive: true, force: true });
fs.mkdirSync(root, { recursive: true });
process.env.NEXT_TELEMETRY_DISABLED = '1';
buildIfNeeded({ log });

const db = await startEmbeddedPg({
  dataDir: path.join(root, 'pg'),
  port: await freePort(),
  dbName: 'tallyvat_bench',
  log: () => {},
});
const stops = [db.stop];
const stopAll = async () => {
  for (const s of stops.reverse()) await s();
};
try {
  migrate({ databaseUrl: db.url, seed: false });
  const pool = dbPool(db.url);
  const q = pool.query;
  if (process.env.BENCH_LOG_SLOW) {
    // Log every statement slower than BENCH_LOG_SLOW ms to the cluster's server.log.
    await q(`ALTER SYSTEM SET log_min_duration_statement = ${Number(process.env.BENCH_LOG_SLOW)}`);
    if (process.env.BENCH_EXPLAIN) {
      // …and their plans (auto_explain, with actual row counts).
      await q(`LOAD 'auto_explain'`);
      await q(`ALTER SYSTEM SET session_preload_libraries = 'auto_explain'`);
      await q(`ALTER SYSTEM SET auto_explain.log_min_duration = ${Number(process.env.BENCH_LOG_SLOW)}`);
      await q(`ALTER SYSTEM SET auto_explain.log_analyze = on`);
      await q(`ALTER SYSTEM SET auto_explain.log_nested_statements = on`);
    }
    await q('SELECT pg_reload_conf()');
  }

  // Last month in Chicago, the co-op's time zone.
  const now = new Intl.DateTimeFormat('en-CA', {
    timeZone: 'America/Chicago',
    year: 'numeric',
    month: '2-digit',
  }).format(new Date());
  const [y, m] = now.split('-').map(Number);
  const d = new Date(Date.UTC(y, m - 2, 1));
  const period = `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`;

  log(`loading ${MEMBERS} members × ${DRAWS} draws in ${period}…`);
  let t = Date.now();
  const hash = await bcrypt.hash(PASSWORD, 10);
  const {
    rows: [coop],
  } = await q(
    `INSERT INTO coops (name, slug, settings) VALUES ('Bench Fuel Co-op', 'bench-coop', '{"monthlyDuesCents": 1500}') RETURNING id`,
  );
  const {
    rows: [tre],
  } = await q(
    `INSERT INTO users (email, name, password_hash) VALUES ('treasurer@bench.example.org', 'Bench Treasurer', $1) RETURNING id`,
    [hash],
  );
  await q(`INSERT INTO memberships (coop_id, user_id, role, joined_at) VALUES ($1, $2, 'treasurer', '2020-01-01')`, [
    coop.id,
    tre.id,
  ]);
  await q(
    `INSERT INTO users (email, name, password_hash) SELECT 'member' || g || '@bench.example.org', 'Member ' || lpad(g::text, 5, '0'), NULL FROM generate_series(1, $1) g`,
    [MEMBERS],
  );
  await q(
    `INSERT INTO memberships (coop_id, user_id, role, joined_at) SELECT $1, id, 'member', '2020-01-01' FROM users WHERE email LIKE 'member%@bench.example.org'`,
    [coop.id],
  );
  const {
    rows: [tank],
  } = await q(`INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Bench tank', 100000) RETURNING id`, [
    coop.id,
  ]);
  // Each draw: 5 gal (18.927 L) for the road at 389 ¢/gal + 10 ¢ surcharge + 24.4 ¢ road tax: 1945 + 50 + 122 = 2117.
  await q(
    `INSERT INTO draws (coop_id, tank_id, membership_id, quantity_liters, declared_use, unit_price_cents_per_gallon, surcharge_cents_per_gallon,
       road_tax_cents_per_gallon, fuel_cents, surcharge_cents, tax_cents, total_cents, occurred_at)
     SELECT $1, $2, m.id, 18.927, 'road', 389, 10, 24.4, 1945, 50, 122, 2117, ($3::date + (k % 27) * interval '1 day' + interval '17 hours')
     FROM memberships m CROSS JOIN generate_series(1, $4) k WHERE m.coop_id = $1 AND m.role = 'member'`,
    [coop.id, tank.id, `${period}-01`, DRAWS],
  );
  await q('ANALYZE');
  log(`loaded in ${((Date.now() - t) / 1000).toFixed(1)} s`);

  const paymentsPort = await freePort();
  const pay = await startPaymentsFake({ port: paymentsPort, log: () => {} });
  stops.push(pay.stop);
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: db.url,
    APP_URL: base,
    NEXTAUTH_URL: base,
    NEXTAUTH_SECRET: crypto.randomBytes(32).toString('base64url'),
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(await freePort()),
    STRIPE_SECRET_KEY: 'sk_test_bench',
    STRIPE_API_HOST: '127.0.0.1',
    STRIPE_API_PORT: String(paymentsPort),
    STRIPE_API_PROTOCOL: 'http',
    STRIPE_WEBHOOK_SECRET: 'whsec_bench',
  };
  const next = spawn(
    process.execPath,
    [path.resolve('node_modules/next/dist/bin/next'), 'start', '-p', String(port), '-H', '127.0.0.1'],
    { env, stdio: ['ignore', 'pipe', 'pipe'] },
  );
  const nextLog = fs.createWriteStream(path.join(root, 'next.log'));
  next.stdout.pipe(nextLog);
  next.stderr.pipe(nextLog);
  stops.push(() => new Promise((r) => (next.exitCode !== null ? r() : (next.once('exit', r), next.kill('SIGTERM')))));
  for (let i = 0; ; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) break;
    } catch {}
    if (i > 240) throw new Error('next start did not come up');
    await new Promise((r) => setTimeout(r, 250));
  }

  // The month run is a job (lib/jobs): the worker drafts the invoices.
  const worker = await startWorkerProcess({ env, stdio: fs.createWriteStream(path.join(root, 'worker.log')) });
  stops.push(worker.stop);

  // Peak memory of the Next server's and the worker's process trees.
  const treeRssKb = () => {
    const pids = [next.pid, worker.child.pid];
    for (const p of fs.readdirSync('/proc').filter((x) => /^\d+$/.test(x))) {
      try {
        const ppid = Number(fs.readFileSync(`/proc/${p}/stat`, 'utf8').split(') ')[1].split(' ')[1]);
        if (pids.includes(ppid)) pids.push(Number(p));
      } catch {}
    }
    let kb = 0;
    for (const p of pids) {
      try {
        kb += Number(/VmRSS:\s+(\d+)/.exec(fs.readFileSync(`/proc/${p}/status`, 'utf8'))?.[1] ?? 0);
      } catch {}
    }
    return kb;
  };
  let peakKb = treeRssKb();
  const idleKb = peakKb;
  const sampler = setInterval(() => (peakKb = Math.max(peakKb, treeRssKb())), 100);

  // Sign in as the treasurer (next-auth credentials flow) with a tiny cookie jar.
  const jar = new Map();
  const keep = (res) =>
    res.headers.getSetCookie().forEach((c) => {
      const [kv] = c.split(';');
      const i = kv.indexOf('=');
      jar.set(kv.slice(0, i), kv.slice(i + 1));
    });
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const call = async (p, init = {}) => {
    const res = await fetch(`${base}${p}`, {
      ...init,
      redirect: 'manual',
      headers: { origin: base, ...(init.headers ?? {}), cookie: cookie() },
    });
    keep(res);
    return res;
  };
  const csrf = await (await call('/api/auth/csrf')).json();
  await call('/api/auth/callback/credentials', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({
      csrfToken: csrf.csrfToken,
      email: 'treasurer@bench.example.org',
      password: PASSWORD,
      json: 'true',
    }),
  });
  const json = (p, body) =>
    call(p, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

  log('1. month run…');
  t = performance.now();
  const started = await json('/api/coops/bench-coop/billing/runs', { period });
  if (started.status !== 202) throw new Error(`run: ${started.status} ${await started.text()}`);
  const { run } = await started.json();
  let done;
  for (;;) {
    done = (await (await call(`/api/coops/bench-coop/billing/runs/${run.id}`)).json()).run;
    if (done.status !== 'running') break;
    await new Promise((r) => setTimeout(r, 100));
  }
  const runMs = performance.now() - t;
  if (done.status !== 'completed') throw new Error(`run ${done.status}: ${done.error}`);
  const runPeakKb = peakKb;
  log(`   ${done.drafts} drafts for ${done.totalMembers} members in ${(runMs / 1000).toFixed(2)} s`);

  log('2. invoice PDFs…');
  const { rows: sample } = await q(`SELECT id FROM invoices WHERE coop_id = $1 ORDER BY id LIMIT 55`, [coop.id]);
  const render = [];
  const request = [];
  for (const [i, { id }] of sample.entries()) {
    const t0 = performance.now();
    const res = await call(`/api/coops/bench-coop/billing/invoices/${id}/pdf`);
    const bytes = Buffer.from(await res.arrayBuffer());
    if (res.status !== 200 || bytes.subarray(0, 5).toString() !== '%PDF-') throw new Error(`pdf ${id}: ${res.status}`);
    if (i < 5) continue; // warm-up
    request.push(performance.now() - t0);
    render.push(Number(/pdf;dur=([\d.]+)/.exec(res.headers.get('server-timing') ?? '')?.[1]));
  }
  const median = (a) => {
    const s = [...a].sort((x, y) => x - y);
    return (s[(s.length - 1) >> 1] + s[s.length >> 1]) / 2;
  };

  log('3. issuing every draft…');
  t = performance.now();
  const issued = await json(`/api/coops/bench-coop/billing/periods/${period}/issue`, {});
  const issueMs = performance.now() - t;
  const issuedBody = await issued.json();
  if (issued.status !== 200) throw new Error(`issue: ${issued.status} ${JSON.stringify(issuedBody)}`);
  clearInterval(sampler);

  const {
    rows: [check],
  } = await q(
    `SELECT count(*)::int AS n, count(DISTINCT number)::int AS numbers, min(number) AS lo, max(number) AS hi, sum(total_cents)::bigint AS total,
            (SELECT count(*) FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id WHERE i.coop_id = $1)::int AS lines
     FROM invoices WHERE coop_id = $1 AND status = 'issued'`,
    [coop.id],
  );
  const result = {
    members: MEMBERS,
    drawsPerMember: DRAWS,
    period,
    runSeconds: +(runMs / 1000).toFixed(2),
    issueSeconds: +(issueMs / 1000).toFixed(2),
    endToEndSeconds: +((runMs + issueMs) / 1000).toFixed(2),
    invoices: check.n,
    lines: check.lines,
    numbers: `${check.lo}–${check.hi} (${check.numbers} distinct)`,
    totalInvoicedCents: Number(check.total),
    expectedTotalCents: (MEMBERS + 1) * 1500 + MEMBERS * DRAWS * 2117,
    serverAndWorkerRssMiB: {
      idle: +(idleKb / 1024).toFixed(0),
      peakDuringRun: +(runPeakKb / 1024).toFixed(0),
      peakOverall: +(peakKb / 1024).toFixed(0),
    },
    pdf: {
      samples: render.length,
      medianRenderMs: +median(render).toFixed(1),
      medianRequestMs: +median(request).toFixed(1),
      maxRenderMs: +Math.max(...render).toFixed(1),
    },
    machine: `${(await import('node:os')).cpus().length} cores, Node ${process.version}`,
  };
  console.log(JSON.stringify(result, null, 2));
  fs.mkdirSync(path.resolve('bench', 'output'), { recursive: true });
  fs.writeFileSync(path.resolve('bench', 'output', 'billing.json'), JSON.stringify(result, null, 2));
  await pool.end();
} finally {
  await stopAll();
  if (process.env.BENCH_LOG_SLOW) log(`slow statements: ${path.join(root, 'pg')}/**/server.log`);
}
