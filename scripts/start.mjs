#!/usr/bin/env node
// `npm start`: prepares everything on a fresh machine and serves Tallyvat with demo data.
//  1. the embedded PostgreSQL (.data/pg), unless DATABASE_URL is set;
//  2. migrations and the demo seeders (each runs once);
//  3. the local fakes: SMTP catcher with an inbox page, the payments fake and the object-storage
//     fake (unless S3_BUCKET names a real store); files of a former local upload folder
//     (.data/uploads) are moved into storage once;
//  4. `next build` when the build is missing or older than the sources, then `next start`;
//  5. the job worker (scripts/worker.mjs) beside it.
// Ctrl-C stops the app, the worker, the fakes and the database it started; so does the death of
// any child process (by exit code or by signal): everything started is stopped within a few
// seconds, the lock file is removed, and the launcher exits non-zero.
// TALLYVAT_DATA_DIR moves the data folder (database, secrets, stored files, lock file) from ./.data.
import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { startEmbeddedPg, portInUse } from './lib/pg.mjs';
import { migrate } from './lib/db-setup.mjs';
import { buildIfNeeded } from './lib/build.mjs';
import { appEnv, startNext, stopChild } from './lib/app.mjs';
import { startMailCatcher, startPaymentsFake, startStorageFake } from './lib/fakes.mjs';
import { startWorkerProcess } from './lib/worker-process.mjs';

const dev = process.argv.includes('--dev');
const PORT = Number(process.env.PORT ?? 3000);
const offset = PORT - 3000; // side-by-side checkouts: every helper port moves with PORT
const PG_PORT = Number(process.env.PG_PORT ?? 54329 + offset);
const SMTP_PORT = Number(process.env.SMTP_PORT ?? 2525 + offset);
const MAIL_UI_PORT = Number(process.env.MAIL_UI_PORT ?? 1080 + offset);
const PAYMENTS_PORT = Number(process.env.PAYMENTS_PORT ?? 12111 + offset);
const STORAGE_PORT = Number(process.env.STORAGE_PORT ?? 4568 + offset);
const DATA = path.resolve(process.env.TALLYVAT_DATA_DIR ?? '.data');
const LOCK = path.join(DATA, 'app.lock');

const log = (...a) => console.log('[tallyvat]', ...a);
const fail = (msg) => {
  console.error(`\n[tallyvat] ${msg}\n`);
  process.exit(1);
};

fs.mkdirSync(DATA, { recursive: true });
if (fs.existsSync(LOCK)) {
  const { pid, port } = JSON.parse(fs.readFileSync(LOCK, 'utf8'));
  let alive = false;
  try {
    process.kill(pid, 0);
    alive = true;
  } catch {
    /* stale lock */
  }
  if (alive)
    fail(
      `Tallyvat is already running from this folder (pid ${pid}) on http://localhost:${port}. Stop it with Ctrl-C in its terminal first.`,
    );
}
const ownStorage = !process.env.S3_BUCKET;
for (const [name, p] of [
  ['PORT', PORT],
  ['SMTP_PORT', SMTP_PORT],
  ['MAIL_UI_PORT', MAIL_UI_PORT],
  ['PAYMENTS_PORT', PAYMENTS_PORT],
  ...(ownStorage ? [['STORAGE_PORT', STORAGE_PORT]] : []),
]) {
  if (await portInUse(p)) fail(`Port ${p} (${name}) is already in use. Free it or set ${name}=<another port>.`);
}
/** The lock file names this launcher, its port, and the pid of each child it supervises. */
const lockInfo = { pid: process.pid, port: PORT, children: {} };
const writeLock = () => fs.writeFileSync(LOCK, JSON.stringify(lockInfo));
writeLock();

/** The child processes this launcher runs (the Next server; a worker too, when there is one). */
const children = {};
/** Everything to undo on the way out, run last-first: servers, fakes, the database. */
const cleanups = [];
/** Upper bounds for stopping one thing and everything (a child gets SIGTERM, then SIGKILL after 3 s). */
const STEP_DEADLINE_MS = 4_000;
const SHUTDOWN_DEADLINE_MS = 9_000;
let stopping = false;
async function shutdown(code = 0) {
  if (stopping) return;
  stopping = true;
  log('stopping…');
  const deadline = setTimeout(() => {
    console.error('[tallyvat] stopping took too long; exiting anyway');
    for (const c of Object.values(children)) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
    fs.rmSync(LOCK, { force: true });
    process.exit(code || 1);
  }, SHUTDOWN_DEADLINE_MS);
  for (const fn of cleanups.reverse()) {
    // One step that hangs (a server waiting on an open connection) must not keep the others running.
    let timer;
    try {
      await Promise.race([fn(), new Promise((resolve) => (timer = setTimeout(resolve, STEP_DEADLINE_MS)))]);
    } catch (e) {
      console.error(e);
    } finally {
      clearTimeout(timer);
    }
  }
  clearTimeout(deadline);
  fs.rmSync(LOCK, { force: true });
  log('stopped.');
  process.exit(code);
}
process.on('SIGINT', () => shutdown(0));
process.on('SIGTERM', () => shutdown(0));

/**
 * Watches a child process: it is stopped with everything else on the way out, and when it dies on
 * its own — with any exit code or by a signal — the launcher stops everything and exits non-zero.
 */
function supervise(name, child) {
  children[name] = child;
  lockInfo.children[name] = child.pid;
  writeLock();
  cleanups.push(() => stopChild(child, 3_000));
  child.on('exit', (code, signal) => {
    if (stopping) return;
    console.error(
      `\n[tallyvat] ${name} stopped unexpectedly (${signal ? `signal ${signal}` : `exit code ${code}`}); stopping everything.\n`,
    );
    shutdown(code || 1);
  });
}

try {
  let databaseUrl = process.env.DATABASE_URL;
  if (databaseUrl) {
    log('Using DATABASE_URL (the embedded PostgreSQL is not started)');
  } else {
    const pg = await startEmbeddedPg({ dataDir: path.join(DATA, 'pg'), port: PG_PORT, dbName: 'tallyvat', log });
    databaseUrl = pg.url;
    if (pg.started) cleanups.push(pg.stop);
    log(`PostgreSQL on 127.0.0.1:${PG_PORT} (data in ${path.relative(process.cwd(), path.join(DATA, 'pg')) || '.'})`);
  }
  log('Applying migrations and demo data…');
  migrate({ databaseUrl, seed: true });

  const mail = await startMailCatcher({ smtpPort: SMTP_PORT, httpPort: MAIL_UI_PORT, log });
  cleanups.push(mail.stop);
  // The fake signs its webhook events with this secret and the app verifies them with it.
  const webhookSecretFile = path.join(DATA, 'stripe-webhook-secret');
  if (!process.env.STRIPE_WEBHOOK_SECRET && !fs.existsSync(webhookSecretFile)) {
    fs.writeFileSync(webhookSecretFile, `whsec_${crypto.randomBytes(24).toString('base64url')}`, { mode: 0o600 });
  }
  const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET ?? fs.readFileSync(webhookSecretFile, 'utf8').trim();
  const pay = await startPaymentsFake({
    port: PAYMENTS_PORT,
    webhookUrl: `http://127.0.0.1:${PORT}/api/payments/webhook`,
    webhookSecret,
    log,
  });
  cleanups.push(pay.stop);

  let storage = {};
  if (ownStorage) {
    const fake = await startStorageFake({ port: STORAGE_PORT, directory: path.join(DATA, 's3'), log });
    cleanups.push(fake.stop);
    storage = fake.env;
  } else log(`Using the object store in S3_BUCKET (${process.env.S3_BUCKET}); the storage fake is not started`);

  const secretFile = path.join(DATA, 'nextauth-secret');
  if (!process.env.NEXTAUTH_SECRET && !fs.existsSync(secretFile)) {
    fs.writeFileSync(secretFile, crypto.randomBytes(32).toString('base64url'), { mode: 0o600 });
  }
  const env = appEnv({
    databaseUrl,
    appUrl: process.env.APP_URL ?? `http://localhost:${PORT}`,
    secret: process.env.NEXTAUTH_SECRET ?? fs.readFileSync(secretFile, 'utf8').trim(),
    smtpPort: SMTP_PORT,
    paymentsPort: PAYMENTS_PORT,
    webhookSecret,
    storage,
    extra: { MAIL_UI_URL: `http://127.0.0.1:${MAIL_UI_PORT}/` },
  });

  // Files from before object storage (a local upload folder) move into the bucket once.
  const legacyUploads = path.resolve(process.env.STORAGE_DIR ?? path.join(DATA, 'uploads'));
  if (fs.existsSync(legacyUploads)) {
    log(`Moving the files in ${legacyUploads} into object storage…`);
    // A child process, awaited without blocking: the storage fake it talks to runs in this process.
    const child = spawn(process.execPath, [path.resolve('scripts', 'storage-import.mjs'), legacyUploads], {
      env,
      stdio: 'inherit',
    });
    const code = await new Promise((resolve) => child.once('exit', (c, signal) => resolve(signal ?? c)));
    if (code !== 0)
      throw new Error(
        `moving ${legacyUploads} into object storage failed (exit ${code}); see above, fix, and start again`,
      );
    fs.renameSync(legacyUploads, `${legacyUploads}.imported`);
    log(`Done; the old folder is kept as ${legacyUploads}.imported (delete it when you are happy).`);
  }

  // TALLYVAT_SKIP_BUILD=1 serves the build that is there, even if sources are newer (the launcher test).
  if (!dev && process.env.TALLYVAT_SKIP_BUILD !== '1') buildIfNeeded({ env, log });
  supervise('worker', (await startWorkerProcess({ env, log })).child);
  supervise('next', startNext({ env, port: PORT, dev }).child);
  log(`Tallyvat: http://localhost:${PORT}   caught e-mail: http://127.0.0.1:${MAIL_UI_PORT}/`);
  log(
    'Demo sign-ins (password tallyvat-demo-2026): marisol.admin@example.org, tobias.treasurer@example.org, juniper.brewer@example.org, dale.member@example.org',
  );
} catch (e) {
  console.error(`\n[tallyvat] ${e.message}\n`);
  await shutdown(1);
}
