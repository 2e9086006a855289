// Starts the real parts the integration tests talk to: a throw-away PostgreSQL cluster
// (.data/test-pg, fsync off), migrations and demo data, the SMTP catcher, the payments fake,
// the object-storage fake, and `next start` on a random loopback port. Everything is stopped when the run ends.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
// @ts-expect-error plain ESM helpers shared with the start script
import { startEmbeddedPg, freePort, stopLeftover } from '../../scripts/lib/pg.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { migrate } from '../../scripts/lib/db-setup.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { appEnv, startNext, waitForHealth } from '../../scripts/lib/app.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { startWorkerProcess } from '../../scripts/lib/worker-process.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { startMailCatcher, startPaymentsFake, startStorageFake } from '../../scripts/lib/fakes.mjs';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    databaseUrl: string;
    mailUrl: string;
    paymentsUrl: string;
    /** The S3_* environment of the storage fake, as JSON. */
    storageEnv: string;
    /** The worker's environment, for tests that stop and start a worker of their own. */
    workerEnv: string;
  }
}

const quiet = () => {};

export default async function setup(project: TestProject) {
  const root = path.resolve('.data', 'test');
  stopLeftover(path.join(root, 'pg'));
  fs.rmSync(root, { recursive: true, force: true });
  fs.mkdirSync(root, { recursive: true });
  const stops: (() => unknown)[] = [];

  let databaseUrl = process.env.TEST_DATABASE_URL;
  if (!databaseUrl) {
    const pg = await startEmbeddedPg({
      dataDir: path.join(root, 'pg'),
      port: await freePort(),
      dbName: 'tallyvat_test',
      fast: true,
      log: quiet,
    });
    databaseUrl = pg.url as string;
    stops.push(pg.stop);
  }
  migrate({ databaseUrl, seed: true });

  const smtpPort = await freePort();
  const mailPort = await freePort();
  const paymentsPort = await freePort();
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const mail = await startMailCatcher({ smtpPort, httpPort: mailPort, log: quiet });
  stops.push(mail.stop);
  const pay = await startPaymentsFake({
    port: paymentsPort,
    webhookUrl: `${baseUrl}/api/payments/webhook`,
    webhookSecret: 'whsec_tallyvat_test',
    log: quiet,
  });
  stops.push(pay.stop);

  const storage = await startStorageFake({ port: await freePort(), directory: path.join(root, 's3'), log: quiet });
  stops.push(storage.stop);
  const env = appEnv({
    databaseUrl,
    appUrl: baseUrl,
    secret: crypto.randomBytes(32).toString('base64url'),
    smtpPort,
    paymentsPort,
    webhookSecret: 'whsec_tallyvat_test',
    storage: storage.env,
    // Overview charts are cached for a minute in production; tests read every figure fresh. The
    // worker's timed jobs are off (JOB_SCHEDULES): a minute's expiry must not land inside a test.
    extra: {
      NODE_ENV: 'production',
      OVERVIEW_CACHE_SECONDS: '0',
      JOB_SCHEDULES: 'off',
      LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
    },
  });
  const log = fs.createWriteStream(path.join(root, 'next.log'));
  // The job worker (e-mail, billing runs, schedules) beside the server, as `npm start` runs it.
  const workerLog = fs.createWriteStream(path.join(root, 'worker.log'));
  const worker = await startWorkerProcess({ env, stdio: workerLog });
  // A test may kill this worker and start another (tests/support/worker.ts): the file names the live one.
  const workerPidFile = path.join(root, 'worker.pid');
  fs.writeFileSync(workerPidFile, String(worker.child.pid));
  stops.unshift(async () => {
    const pid = Number(fs.readFileSync(workerPidFile, 'utf8'));
    if (pid === worker.child.pid) return worker.stop();
    try {
      process.kill(pid, 'SIGTERM');
      for (let i = 0; i < 100; i++) {
        process.kill(pid, 0);
        await new Promise((r) => setTimeout(r, 200));
      }
    } catch {
      /* gone */
    }
  });
  const { child: next, stop: stopNext } = startNext({
    env,
    port,
    host: '127.0.0.1',
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  next.stdout?.pipe(log);
  next.stderr?.pipe(log);
  stops.unshift(stopNext);
  try {
    await waitForHealth(baseUrl, next);
  } catch {
    for (const s of stops) await s();
    throw new Error(`next start did not come up; see ${path.join(root, 'next.log')}`);
  }

  project.provide('baseUrl', baseUrl);
  project.provide('databaseUrl', databaseUrl);
  project.provide('mailUrl', `http://127.0.0.1:${mailPort}`);
  project.provide('paymentsUrl', `http://127.0.0.1:${paymentsPort}`);
  project.provide('storageEnv', JSON.stringify(storage.env));
  project.provide('workerEnv', JSON.stringify(env));

  return async () => {
    for (const s of stops) await s();
  };
}
