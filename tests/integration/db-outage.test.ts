// The database goes away and comes back under a running server: while it is down every API answers
// 503 {error, retryAfter} with a Retry-After header (never 500), health answers 503 and the server
// stays up; once it is back, requests succeed again within 5 s; every write that was answered 2xx
// is in the database afterwards; and the log records the outage once (down, then up), not once per
// request. Liveness stays 200 throughout; readiness names the database as down and recovers.
// The job worker beside it stays alive through the outage, logs it once each way (paused, resumed)
// and takes a job queued after the database is back.
// This test runs its own PostgreSQL (which it stops and starts), storage fake, mail catcher, `next start` and worker.
import type { ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import { QueryTypes, Sequelize } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { withBrowser } from '../support/browser';
// @ts-expect-error plain ESM helpers shared with the start script
import { startEmbeddedPg, freePort, stopLeftover } from '../../scripts/lib/pg.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { migrate } from '../../scripts/lib/db-setup.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { appEnv, startNext, stopChild, waitForHealth } from '../../scripts/lib/app.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { startMailCatcher, startStorageFake } from '../../scripts/lib/fakes.mjs';
// @ts-expect-error plain ESM helpers shared with the start script
import { startWorkerProcess } from '../../scripts/lib/worker-process.mjs';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const root = path.resolve('.data', `outage-${crypto.randomBytes(3).toString('hex')}`);
const EMAIL = 'outage@example.test';
const PASSWORD = 'outage-test-password-2026';

let pgPort = 0;
let databaseUrl = '';
let stopPg: () => void = () => {};
let next: ChildProcess | null = null;
let stopStorage: () => Promise<void> = async () => {};
let baseUrl = '';
let logText = '';
let worker: { child: ChildProcess; stop: () => Promise<void> } | null = null;
let workerLog = '';
let catcher: { messages: () => Promise<{ to: string; subject: string }[]>; stop: () => Promise<void> } | null = null;

/** A connection to the test's database apart from the server's, for arranging and checking rows. */
const directConnection = () => new Sequelize(databaseUrl, { logging: false, pool: { max: 1, min: 0 } });

/** Starts the test's own PostgreSQL on its data folder and port (a restart reuses both). */
async function startPg() {
  const p = await startEmbeddedPg({
    dataDir: path.join(root, 'pg'),
    port: pgPort,
    dbName: 'tallyvat_outage',
    log: () => {},
  });
  databaseUrl = p.url as string;
  stopPg = p.stop as () => void;
}

beforeAll(async () => {
  pgPort = await freePort();
  await startPg();
  migrate({ databaseUrl });
  const store = directConnection();
  await store.query('INSERT INTO users (email, name, password_hash) VALUES ($1, $2, $3)', {
    bind: [EMAIL, 'Outage Tester', bcrypt.hashSync(PASSWORD, 10)],
    type: QueryTypes.INSERT,
  });
  await store.close();

  const storage = await startStorageFake({ port: await freePort(), directory: path.join(root, 's3'), log: () => {} });
  stopStorage = storage.stop;
  const port = await freePort();
  baseUrl = `http://127.0.0.1:${port}`;
  const smtpPort = await freePort();
  catcher = await startMailCatcher({ smtpPort, httpPort: await freePort(), log: () => {} });
  const env = appEnv({
    databaseUrl,
    appUrl: baseUrl,
    secret: crypto.randomBytes(32).toString('base64url'),
    smtpPort,
    paymentsPort: await freePort(),
    webhookSecret: 'whsec_tallyvat_outage',
    storage: storage.env,
    extra: { NODE_ENV: 'production', LOG_LEVEL: 'info', NEXTAUTH_URL: baseUrl },
  });
  next = startNext({ env, port, host: '127.0.0.1', stdio: ['ignore', 'pipe', 'pipe'] }).child as ChildProcess;
  next.stdout?.on('data', (d) => (logText += d));
  next.stderr?.on('data', (d) => (logText += d));
  await waitForHealth(baseUrl, next);
  const { PassThrough } = await import('node:stream');
  const out = new PassThrough();
  out.on('data', (d) => (workerLog += d));
  worker = await startWorkerProcess({ env: { ...env, JOB_SCHEDULES: 'off', TALLYVAT_SERVICE: 'worker' }, stdio: out });
}, 180_000);

afterAll(async () => {
  if (worker) await worker.stop();
  await catcher?.stop();
  if (next) await stopChild(next);
  await stopStorage();
  stopPg();
  stopLeftover(path.join(root, 'pg'));
  fs.rmSync(root, { recursive: true, force: true });
});

/** JSON log lines of the server, parsed (Next's own banner lines are skipped). */
function logLines(): Record<string, unknown>[] {
  return logText
    .split('\n')
    .filter((l) => l.startsWith('{'))
    .map((l) => {
      try {
        return JSON.parse(l) as Record<string, unknown>;
      } catch {
        return {};
      }
    });
}

describe('database outage', () => {
  it(
    'answers 503 with retryAfter while PostgreSQL is down, 200 within 5 s of its return, loses no acknowledged write, logs the outage once',
    { timeout: 180_000 },
    async () => {
      const agent = request.agent(baseUrl);
      const csrf = await agent.get('/api/auth/csrf').expect(200);
      await agent
        .post('/api/auth/callback/credentials')
        .set('Origin', baseUrl)
        .type('form')
        .send({ csrfToken: csrf.body.csrfToken, email: EMAIL, password: PASSWORD, json: 'true' })
        .expect(200);
      await agent.get('/api/coops').expect(200);

      // Writers create co-ops one after another the whole time, through the outage and after it.
      const writes: { slug: string; status: number; phase: string }[] = [];
      let phase = 'before';
      let writing = true;
      const writer = async (w: number) => {
        for (let i = 0; writing; i++) {
          const slug = `outage-${w}-${i}-${crypto.randomBytes(2).toString('hex')}`;
          const at = phase;
          const res = await agent
            .post('/api/coops')
            .set('Origin', baseUrl)
            .send({ name: `Outage ${slug}`, slug, units: 'us', timezone: 'UTC' });
          writes.push({ slug, status: res.status, phase: at });
          await sleep(res.status === 201 ? 50 : 200);
        }
      };
      const writers = [writer(1), writer(2)];
      await sleep(1_500);

      phase = 'down';
      stopPg();
      await sleep(300);
      for (const url of ['/api/coops', '/api/me']) {
        const res = await agent.get(url);
        expect(res.status, `${url} while the database is down: ${JSON.stringify(res.body)}`).toBe(503);
        expect(typeof res.body.error).toBe('string');
        expect(res.body.retryAfter).toBeGreaterThan(0);
        expect(Number(res.headers['retry-after'])).toBe(res.body.retryAfter);
      }
      // Many requests meet the outage; none of them may be answered 500 or crash the server.
      const during = await Promise.all(Array.from({ length: 20 }, () => agent.get('/api/coops')));
      expect(during.map((r) => r.status)).toEqual(Array(20).fill(503));
      const health = await fetch(`${baseUrl}/api/health`);
      expect(health.status).toBe(503);
      // Alive (no restart wanted), but not ready: the load balancer takes it out of rotation.
      expect((await fetch(`${baseUrl}/api/live`)).status).toBe(200);
      const ready = await fetch(`${baseUrl}/api/ready`);
      expect(ready.status).toBe(503);
      expect(await ready.json()).toEqual({ status: 'not-ready', db: 'down', storage: 'ok' });
      await sleep(1_500);
      expect(next!.exitCode).toBeNull();
      expect(next!.signalCode).toBeNull();
      expect(worker!.child.exitCode, workerLog.slice(-4000)).toBeNull();
      expect(worker!.child.signalCode).toBeNull();

      phase = 'after';
      await startPg();
      const back = Date.now();
      for (;;) {
        const res = await agent.get('/api/coops');
        if (res.status === 200) break;
        expect(res.status).toBe(503);
        expect(Date.now() - back, 'the API answers 200 again within 5 s of the database returning').toBeLessThan(5_000);
        await sleep(100);
      }
      expect((await fetch(`${baseUrl}/api/health`)).status).toBe(200);
      expect((await fetch(`${baseUrl}/api/ready`)).status).toBe(200);
      await sleep(1_500);
      writing = false;
      await Promise.all(writers);

      expect(
        writes.filter((w) => w.status !== 201 && w.status !== 503),
        'every write answered 201 or 503',
      ).toEqual([]);
      expect(writes.filter((w) => w.phase === 'before' && w.status === 201).length).toBeGreaterThan(0);
      expect(writes.filter((w) => w.phase === 'down' && w.status === 503).length).toBeGreaterThan(0);
      expect(writes.filter((w) => w.phase === 'after' && w.status === 201).length).toBeGreaterThan(0);

      const store = directConnection();
      const rows = await store.query<{ slug: string }>('SELECT slug FROM coops WHERE slug = ANY($1)', {
        bind: [writes.map((w) => w.slug)],
        type: QueryTypes.SELECT,
      });
      await store.close();
      const stored = new Set(rows.map((r) => r.slug));
      expect(
        writes.filter((w) => w.status === 201 && !stored.has(w.slug)),
        'acknowledged writes missing from the database',
      ).toEqual([]);

      // The outage is in the log once each way, whatever the number of requests that met it.
      const lines = logLines();
      expect(lines.filter((l) => l.event === 'database.down')).toHaveLength(1);
      expect(lines.filter((l) => l.event === 'database.up')).toHaveLength(1);
      expect(lines.filter((l) => l.level === 'error' || l.level === 'fatal').length, logText.slice(-4000)).toBe(1);
      // The worker: alive, paused once and resumed once, and it takes a job queued after the return.
      expect(worker!.child.exitCode, workerLog.slice(-4000)).toBeNull();
      const queued = directConnection();
      await queued.query(`INSERT INTO pgboss.job (name, data) VALUES ('mail', $1::jsonb)`, {
        bind: [
          JSON.stringify({
            to: 'after-outage@example.test',
            subject: 'After the outage',
            text: 'Sent once the database was back.',
            record: { kind: 'none' },
          }),
        ],
      });
      await queued.close();
      const sentBy = Date.now() + 30_000;
      while (!(await catcher!.messages()).some((m) => m.to.includes('after-outage@example.test'))) {
        expect(Date.now(), workerLog.slice(-4000)).toBeLessThan(sentBy);
        await sleep(200);
      }
      const workerEvents = workerLog
        .split('\n')
        .filter((l) => l.startsWith('{'))
        .map((l) => JSON.parse(l) as Record<string, unknown>);
      expect(
        workerEvents.filter((l) => l.event === 'worker.paused'),
        workerLog.slice(-4000),
      ).toHaveLength(1);
      expect(workerEvents.filter((l) => l.event === 'worker.resumed')).toHaveLength(1);
      expect(
        workerLog.split('\n').filter((l) => l.includes('[worker] pg-boss:')),
        'no pg-boss error line per poll',
      ).toEqual([]);
      // Every API request has its structured line.
      const access = lines.filter((l) => l.msg === 'request' && l.route === '/api/coops');
      expect(access.length).toBeGreaterThan(20);
      expect(
        access.every(
          (l) => typeof l.requestId === 'string' && typeof l.status === 'number' && typeof l.durationMs === 'number',
        ),
      ).toBe(true);
    },
  );

  it(
    'a page shows the "we can\'t reach the database" state with a reference, and comes back by itself',
    { timeout: 180_000 },
    async () => {
      await withBrowser(async (page) => {
        await page.goto(`${baseUrl}/sign-in`);
        await page.getByLabel('E-mail').fill(EMAIL);
        await page.getByLabel('Password').fill(PASSWORD);
        await Promise.all([
          page.waitForURL((u) => !u.pathname.startsWith('/sign-in')),
          page.getByRole('button', { name: 'Sign in' }).click(),
        ]);

        stopPg();
        await page.goto(`${baseUrl}/coops`);
        await page.getByRole('heading', { name: 'We can’t reach the database' }).waitFor({ timeout: 20_000 });
        expect(await page.getByText('Reference:').textContent()).toMatch(/Reference: \S+/);

        await startPg();
        // The page checks again every few seconds and shows itself once the database answers.
        await page.locator('[data-state="database-unavailable"]').waitFor({ state: 'detached', timeout: 20_000 });
        await page
          .locator('[data-state="error"], [data-state="checking"]')
          .waitFor({ state: 'detached', timeout: 10_000 });
        expect(await page.locator('main').first().textContent()).not.toContain('reach the database');
      });
      // The page views that met the outage add no stack traces: one line down, one line up, per outage.
      await sleep(500);
      const lines = logLines();
      expect(lines.filter((l) => l.event === 'database.down')).toHaveLength(2);
      expect(lines.filter((l) => l.event === 'database.up')).toHaveLength(2);
      expect(
        logText.split('\n').filter((l) => /Sequelize\w*Error|ECONNREFUSED/.test(l) && !l.includes('"database.down"')),
        logText.slice(-4000),
      ).toEqual([]);
    },
  );
});
