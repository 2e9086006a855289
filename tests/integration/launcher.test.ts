// The launcher (`npm start`) stops everything it started when a child dies: here the Next server is
// killed with SIGKILL (exit code null, signal set), and within 10 s the launcher must have exited
// non-zero, closed every port it opened (app, PostgreSQL, SMTP catcher and its inbox page, payments
// fake, storage fake) and removed its lock file. It runs the real start script on a throw-away data
// folder, which holds a file in the former local upload folder: the launcher moves it into storage.
import { spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { afterAll, describe, expect, it } from 'vitest';
// @ts-expect-error plain ESM helpers shared with the start script
import { freePort, stopLeftover } from '../../scripts/lib/pg.mjs';

/** True when something accepts connections on 127.0.0.1:port. */
function listening(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ port, host: '127.0.0.1' });
    s.once('connect', () => {
      s.destroy();
      resolve(true);
    });
    s.once('error', () => resolve(false));
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

const dataDir = path.resolve('.data', `launcher-${crypto.randomBytes(3).toString('hex')}`);
let launcher: ChildProcess | null = null;

afterAll(() => {
  if (launcher && launcher.exitCode === null && launcher.signalCode === null) launcher.kill('SIGKILL');
  stopLeftover(path.join(dataDir, 'pg'));
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('scripts/start.mjs', () => {
  it(
    'stops PostgreSQL, the fakes and itself, and removes its lock, within 10 s of the Next server dying by SIGKILL',
    { timeout: 240_000 },
    async () => {
      const ports = {
        PORT: await freePort(),
        PG_PORT: await freePort(),
        SMTP_PORT: await freePort(),
        MAIL_UI_PORT: await freePort(),
        PAYMENTS_PORT: await freePort(),
        STORAGE_PORT: await freePort(),
      };
      // A file stored the old way (a local folder), to be moved into the storage fake at start.
      const legacyKey = `1/${crypto.randomUUID()}.pdf`;
      const legacyBytes = Buffer.from('%PDF-1.4\nlegacy lab report\n%%EOF\n');
      fs.mkdirSync(path.join(dataDir, 'uploads', '1'), { recursive: true });
      fs.writeFileSync(path.join(dataDir, 'uploads', legacyKey), legacyBytes);
      const env: NodeJS.ProcessEnv = {
        ...process.env,
        NODE_ENV: 'production',
        TALLYVAT_DATA_DIR: dataDir,
        TALLYVAT_SKIP_BUILD: '1',
        LOG_LEVEL: 'warn',
      };
      for (const k of [
        'DATABASE_URL',
        'NEXTAUTH_SECRET',
        'STRIPE_WEBHOOK_SECRET',
        'STORAGE_DIR',
        'APP_URL',
        'NEXTAUTH_URL',
        'S3_BUCKET',
        'S3_ENDPOINT',
        'S3_KEY_PREFIX',
      ])
        delete env[k];
      for (const [k, v] of Object.entries(ports)) env[k] = String(v);

      let output = '';
      launcher = spawn(process.execPath, ['scripts/start.mjs'], { env, stdio: ['ignore', 'pipe', 'pipe'] });
      launcher.stdout?.on('data', (d) => (output += d));
      launcher.stderr?.on('data', (d) => (output += d));
      const exited = new Promise<{ code: number | null; at: number }>((resolve) =>
        launcher!.once('exit', (code) => resolve({ code, at: Date.now() })),
      );

      const lockFile = path.join(dataDir, 'app.lock');
      const deadline = Date.now() + 200_000;
      for (;;) {
        if (launcher.exitCode !== null) throw new Error(`the launcher exited early:\n${output}`);
        if (Date.now() > deadline) throw new Error(`the app did not come up:\n${output}`);
        const ok = await fetch(`http://127.0.0.1:${ports.PORT}/api/health`).then(
          (r) => r.ok,
          () => false,
        );
        if (ok) break;
        await sleep(500);
      }
      for (const p of Object.values(ports)) expect(await listening(p), `port ${p} open while running`).toBe(true);

      // The former upload folder was moved into the bucket under the same key and set aside.
      expect(fs.existsSync(path.join(dataDir, 'uploads.imported', legacyKey))).toBe(true);
      expect(fs.existsSync(path.join(dataDir, 'uploads'))).toBe(false);
      const s3 = new S3Client({
        endpoint: `http://127.0.0.1:${ports.STORAGE_PORT}`,
        region: 'us-east-1',
        forcePathStyle: true,
        credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
      });
      const obj = await s3.send(new GetObjectCommand({ Bucket: 'tallyvat', Key: `coops/${legacyKey}` }));
      expect(Buffer.from(await obj.Body!.transformToByteArray()).equals(legacyBytes)).toBe(true);
      s3.destroy();

      const lock = JSON.parse(fs.readFileSync(lockFile, 'utf8')) as { pid: number; children: Record<string, number> };
      expect(lock.pid).toBe(launcher.pid);
      const nextPid = lock.children.next;
      expect(nextPid).toBeGreaterThan(0);

      const killedAt = Date.now();
      process.kill(nextPid!, 'SIGKILL');
      const result = await Promise.race([exited, sleep(10_000).then(() => null)]);
      expect(result, `the launcher was still running 10 s after its Next server died:\n${output}`).not.toBeNull();
      expect(result!.at - killedAt).toBeLessThan(10_000);
      expect(result!.code).not.toBe(0);
      for (const [name, p] of Object.entries(ports)) expect(await listening(p), `${name} ${p} still open`).toBe(false);
      expect(fs.existsSync(lockFile)).toBe(false);
    },
  );
});
