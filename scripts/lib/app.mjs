// The app process as the start script, the tests and the benchmarks run it: one environment
// (database, e-mail catcher, payments fake, object storage) and one way to start `next` and wait for it.
import { spawn } from 'node:child_process';
import path from 'node:path';

/**
 * Environment for the Next server, pointing it at the local services. `storage` is the S3_*
 * environment of the object store (`startStorageFake(...).env`); without it, uploads and
 * downloads answer that storage is not configured.
 * @param {{databaseUrl: string, appUrl: string, secret: string, smtpPort: number, paymentsPort: number,
 *   webhookSecret: string, storage?: Record<string, string>, extra?: Record<string, string>}} o
 */
export function appEnv(o) {
  return {
    ...process.env,
    NEXT_TELEMETRY_DISABLED: '1',
    DATABASE_URL: o.databaseUrl,
    APP_URL: o.appUrl,
    NEXTAUTH_URL: process.env.NEXTAUTH_URL ?? o.appUrl,
    NEXTAUTH_SECRET: o.secret,
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(o.smtpPort),
    MAIL_FROM: process.env.MAIL_FROM ?? 'Tallyvat <no-reply@tallyvat.localhost>',
    STRIPE_SECRET_KEY: process.env.STRIPE_SECRET_KEY ?? 'sk_test_tallyvat_local',
    STRIPE_API_HOST: '127.0.0.1',
    STRIPE_API_PORT: String(o.paymentsPort),
    STRIPE_API_PROTOCOL: 'http',
    STRIPE_WEBHOOK_SECRET: o.webhookSecret,
    ...(o.storage ?? {}),
    ...(o.extra ?? {}),
  };
}

/** True once a child process has ended, whether it exited with a code or was killed by a signal. */
export function hasExited(child) {
  return child.exitCode !== null || child.signalCode !== null;
}

/**
 * Ends a child process: SIGTERM, then SIGKILL when it is still there after graceMs. Resolves once it
 * has gone (at once when it already has: a child killed by a signal has exitCode null and signalCode set).
 * @param {import('node:child_process').ChildProcess} child
 */
export function stopChild(child, graceMs = 5_000) {
  return new Promise((resolve) => {
    if (hasExited(child)) return resolve();
    const force = setTimeout(() => {
      if (!hasExited(child)) child.kill('SIGKILL');
    }, graceMs);
    child.once('exit', () => {
      clearTimeout(force);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

/**
 * Starts `next start` (or `next dev`) as a child of this process; `stop()` ends it.
 * @param {{env: object, port: number, host?: string, dev?: boolean, nodeArgs?: string[], stdio?: any}} o
 */
export function startNext(o) {
  const args = [
    ...(o.nodeArgs ?? []),
    path.resolve('node_modules', 'next', 'dist', 'bin', 'next'),
    o.dev ? 'dev' : 'start',
    '-p',
    String(o.port),
  ];
  if (o.host) args.push('-H', o.host);
  const child = spawn(process.execPath, args, { env: o.env, stdio: o.stdio ?? 'inherit' });
  return { child, stop: () => stopChild(child) };
}

/** Waits until GET /api/health answers 200; throws when the child exits or after timeoutMs. */
export async function waitForHealth(baseUrl, child, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) return;
    } catch {
      /* not up yet */
    }
    if (hasExited(child) || Date.now() > deadline) throw new Error('next start did not come up');
    await new Promise((r) => setTimeout(r, 250));
  }
}
