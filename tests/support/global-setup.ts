// Starts the real parts the integration tests talk to: a throw-away PostgreSQL cluster
// (.data/test-pg, fsync off), migrations and demo data, the SMTP catcher, the payments fake,
// and `next start` on a random loopback port. Everything is stopped when the run ends.
import { spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
// @ts-expect-error plain ESM helpers shared with the start script
import { startEmbeddedPg, freePort, stopLeftover } from '../../scripts/lib/pg.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { migrate } from '../../scripts/lib/db-setup.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { startMailCatcher, startPaymentsFake } from '../../scripts/lib/fakes.mjs';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    databaseUrl: string;
    mailUrl: string;
    paymentsUrl: string;
    storageDir: string;
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
    const pg = await startEmbeddedPg({ dataDir: path.join(root, 'pg'), port: await freePort(), dbName: 'tallyvat_test', fast: true, log: quiet });
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
  const pay = await startPaymentsFake({ port: paymentsPort, webhookUrl: `${baseUrl}/api/payments/webhook`, webhookSecret: 'whsec_tallyvat_test', log: quiet });
  stops.push(pay.stop);

  const storageDir = path.join(root, 'uploads');
  const env = {
    ...process.env,
    NODE_ENV: 'production' as const,
    NEXT_TELEMETRY_DISABLED: '1',
    DATABASE_URL: databaseUrl,
    APP_URL: baseUrl,
    NEXTAUTH_URL: baseUrl,
    NEXTAUTH_SECRET: crypto.randomBytes(32).toString('base64url'),
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(smtpPort),
    MAIL_FROM: 'Tallyvat <no-reply@tallyvat.localhost>',
    STRIPE_SECRET_KEY: 'sk_test_tallyvat_local',
    STRIPE_API_HOST: '127.0.0.1',
    STRIPE_API_PORT: String(paymentsPort),
    STRIPE_API_PROTOCOL: 'http',
    STRIPE_WEBHOOK_SECRET: 'whsec_tallyvat_test',
    STORAGE_DIR: storageDir,
    // Overview charts are cached for a minute in production; tests read every figure fresh.
    OVERVIEW_CACHE_SECONDS: '0',
  };
  const log = fs.createWriteStream(path.join(root, 'next.log'));
  const next: ChildProcess = spawn(process.execPath, [path.resolve('node_modules/next/dist/bin/next'), 'start', '-p', String(port), '-H', '127.0.0.1'], { env, stdio: ['ignore', 'pipe', 'pipe'] });
  next.stdout?.pipe(log);
  next.stderr?.pipe(log);
  stops.unshift(() => new Promise<void>((resolve) => {
    if (next.exitCode !== null) return resolve();
    next.once('exit', () => resolve());
    next.kill('SIGTERM');
  }));

  const deadline = Date.now() + 60_000;
  for (;;) {
    try {
      const r = await fetch(`${baseUrl}/api/health`);
      if (r.ok) break;
    } catch {
      /* not up yet */
    }
    if (next.exitCode !== null || Date.now() > deadline) {
      for (const s of stops) await s();
      throw new Error(`next start did not come up; see ${path.join(root, 'next.log')}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }

  project.provide('baseUrl', baseUrl);
  project.provide('databaseUrl', databaseUrl);
  project.provide('mailUrl', `http://127.0.0.1:${mailPort}`);
  project.provide('paymentsUrl', `http://127.0.0.1:${paymentsPort}`);
  project.provide('storageDir', storageDir);

  return async () => {
    for (const s of stops) await s();
  };
}
