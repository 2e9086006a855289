#!/usr/bin/env node
// On-demand benchmark of invoice e-mail throughput (not part of npm test):
//   node bench/email.mjs [invoices=12000] [workers=1]
// Starts its own PostgreSQL, the SMTP catcher and `next start`, loads one co-op with N members
// (monthly dues, so each gets an invoice), runs and issues last month through the API as its
// treasurer, then starts the job worker(s) and times until the catcher has received every
// invoice e-mail (each with its PDF). Budget: 12,000 in under 3 minutes.
// BENCH_CPU_PROF=<dir> writes a V8 CPU profile of the worker(s) when they stop.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import { startEmbeddedPg, freePort, stopLeftover } from '../scripts/lib/pg.mjs';
import { migrate } from '../scripts/lib/db-setup.mjs';
import { buildIfNeeded } from '../scripts/lib/build.mjs';
import { appEnv, startNext, waitForHealth } from '../scripts/lib/app.mjs';
import { startMailCatcher, startPaymentsFake } from '../scripts/lib/fakes.mjs';
import { startWorkerProcess } from '../scripts/lib/worker-process.mjs';
import { dbPool, postgresCpuMeter, serverCpuMs, signInCookie } from './lib.mjs';

const N = Number(process.argv[2] ?? 12_000);
const WORKERS = Number(process.argv[3] ?? 1);
const BUDGET_S = 180 * (N / 12_000);
const log = (...a) => console.log('[bench]', ...a);
const root = path.resolve('.data', 'bench-email');
process.env.NEXT_TELEMETRY_DISABLED = '1';
buildIfNeeded({ log });
stopLeftover(path.join(root, 'pg'));
fs.rmSync(root, { recursive: true, force: true });

const stops = [];
const stopAll = async () => {
  for (const s of stops)
    await Promise.resolve()
      .then(s)
      .catch(() => {});
};
try {
  const db = await startEmbeddedPg({
    dataDir: path.join(root, 'pg'),
    port: await freePort(),
    dbName: 'bench',
    fast: true,
    log: () => {},
  });
  stops.push(db.stop);
  migrate({ databaseUrl: db.url, seed: false });
  const smtpPort = await freePort();
  const mail = await startMailCatcher({ smtpPort, httpPort: await freePort(), log: () => {} });
  stops.unshift(mail.stop);
  const paymentsPort = await freePort();
  const pay = await startPaymentsFake({ port: paymentsPort, log: () => {} });
  stops.unshift(pay.stop);
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const env = appEnv({
    databaseUrl: db.url,
    appUrl: baseUrl,
    secret: crypto.randomBytes(32).toString('base64url'),
    smtpPort,
    paymentsPort,
    webhookSecret: 'whsec_bench',
    extra: { NODE_ENV: 'production' },
  });
  const next = startNext({ env, port, host: '127.0.0.1', stdio: ['ignore', 'ignore', 'inherit'] });
  stops.unshift(next.stop);
  await waitForHealth(baseUrl, next.child);

  // One co-op: a treasurer and N members with monthly dues (users and memberships in bulk).
  const pool = dbPool(db.url);
  stops.unshift(() => pool.end());
  const {
    rows: [coop],
  } = await pool.query(
    `INSERT INTO coops (name, slug, settings) VALUES ('Bench Mail Co-op', 'bench-mail', '{"monthlyDuesCents": 1500}') RETURNING id`,
  );
  const hash = bcrypt.hashSync('bench-password-2026', 10);
  const {
    rows: [t],
  } = await pool.query(
    `INSERT INTO users (email, name, password_hash) VALUES ('treasurer@bench-mail.bench', 'Bench Treasurer', $1) RETURNING id`,
    [hash],
  );
  await pool.query(`INSERT INTO memberships (coop_id, user_id, role) VALUES ($1, $2, 'treasurer')`, [coop.id, t.id]);
  await pool.query(
    `WITH u AS (INSERT INTO users (email, name, password_hash)
       SELECT 'member' || g || '@bench-mail.bench', 'Member ' || lpad(g::text, 6, '0'), 'x' FROM generate_series(1, $1::int) g RETURNING id)
     INSERT INTO memberships (coop_id, user_id, role, joined_at) SELECT $2, id, 'member', '2020-01-01' FROM u`,
    [N, coop.id],
  );
  const cookie = await signInCookie(baseUrl, 'treasurer@bench-mail.bench');
  const now = new Date();
  const last = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1));
  const period = `${last.getUTCFullYear()}-${String(last.getUTCMonth() + 1).padStart(2, '0')}`;
  const post = (p, body) =>
    fetch(`${baseUrl}${p}`, {
      method: 'POST',
      headers: { cookie, 'content-type': 'application/json', origin: baseUrl },
      body: JSON.stringify(body),
    });

  // The run needs a worker; start one now, and time the e-mails from the moment of issuing.
  const workers = [];
  for (let i = 0; i < WORKERS; i++) {
    const w = await startWorkerProcess({
      env,
      nodeArgs: process.env.BENCH_CPU_PROF
        ? ['--cpu-prof', '--cpu-prof-dir', path.resolve(process.env.BENCH_CPU_PROF)]
        : [],
      stdio: fs.createWriteStream(path.join(root, `worker-${i}.log`)),
    });
    workers.push(w);
    stops.unshift(w.stop);
  }
  const run = await (await post(`/api/coops/bench-mail/billing/runs`, { period })).json();
  for (;;) {
    const r = await (
      await fetch(`${baseUrl}/api/coops/bench-mail/billing/runs/${run.run.id}`, { headers: { cookie } })
    ).json();
    if (r.run.status !== 'running') break;
    await new Promise((res) => setTimeout(res, 200));
  }
  const cpu0 = workers.map((w) => serverCpuMs(w.child.pid));
  const catcherCpu0 = process.cpuUsage();
  const pgCpu = postgresCpuMeter(path.join(root, 'pg', 'cluster'));
  const t0 = Date.now();
  const issued = await (await post(`/api/coops/bench-mail/billing/periods/${period}/issue`, {})).json();
  log(`issued ${issued.issued} invoices in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  let lastLog = 0;
  while (mail.received() < N) {
    if (Date.now() - lastLog > 10_000) {
      lastLog = Date.now();
      log(`${mail.received()} / ${N} e-mails after ${((Date.now() - t0) / 1000).toFixed(0)} s`);
    }
    await new Promise((res) => setTimeout(res, 100));
  }
  const seconds = (Date.now() - t0) / 1000;
  const workerCpu = workers.reduce((sum, w, i) => sum + (serverCpuMs(w.child.pid) ?? 0) - (cpu0[i] ?? 0), 0);
  const pgMs = pgCpu();
  const catcherCpu = process.cpuUsage(catcherCpu0);
  // On a busy machine the wall time says little; the CPU per message says what a quiet one would do.
  log(
    `CPU per e-mail: worker ${(workerCpu / N).toFixed(1)} ms, PostgreSQL ${pgMs === null ? '?' : (pgMs / N).toFixed(1)} ms (the issue request included); this process (the SMTP catcher) ${((catcherCpu.user + catcherCpu.system) / 1000 / N).toFixed(1)} ms`,
  );
  const {
    rows: [s],
  } = await pool.query(
    `SELECT count(*) FILTER (WHERE email_status = 'sent') AS sent, count(*) AS total FROM invoices WHERE coop_id = $1`,
    [coop.id],
  );
  log(
    `${N} invoice e-mails delivered in ${seconds.toFixed(1)} s (${(N / seconds).toFixed(1)}/s) with ${WORKERS} worker(s); invoices marked sent: ${s.sent}/${s.total}`,
  );
  log(`budget: ${BUDGET_S.toFixed(0)} s for ${N} (12,000 in 180 s) → ${seconds <= BUDGET_S ? 'met' : 'MISSED'}`);
  await new Promise((res) => setTimeout(res, 1000));
  if (mail.received() !== N) log(`WARNING: the catcher received ${mail.received()} messages for ${N} invoices`);
  await stopAll();
  process.exit(seconds <= BUDGET_S && mail.received() === N ? 0 : 1);
} catch (e) {
  console.error(e);
  await stopAll();
  process.exit(1);
}
