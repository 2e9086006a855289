// The app process as the start script, the tests and the benchmarks run it: one environment
// (database, e-mail catcher, payments fake, storage) and one way to start `next` and wait for it.
import { spawn } from 'node:child_process';
import path from 'node:path';

/**
 * Environment for the Next server, pointing it at the local services.
 * @param {{databaseUrl: string, appUrl: string, secret: string, smtpPort: number, paymentsPort: number,
 *   webhookSecret: string, storageDir: string, extra?: Record<string, string>}} o
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
    STORAGE_DIR: o.storageDir,
    ...(o.extra ?? {}),
  };
}

/**
 * Starts `next start` (or `next dev`) as a child of this process; `stop()` ends it.
 * @param {{env: object, port: number, host?: string, dev?: boolean, nodeArgs?: string[], stdio?: any}} o
 */
export function startNext(o) {
  const args = [...(o.nodeArgs ?? []), path.resolve('node_modules', 'next', 'dist', 'bin', 'next'), o.dev ? 'dev' : 'start', '-p', String(o.port)];
  if (o.host) args.push('-H', o.host);
  const child = spawn(process.execPath, args, { env: o.env, stdio: o.stdio ?? 'inherit' });
  const stop = () => new Promise((resolve) => {
    if (child.exitCode !== null) return resolve();
    child.once('exit', () => resolve());
    child.kill('SIGTERM');
  });
  return { child, stop };
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
    if (child.exitCode !== null || Date.now() > deadline) throw new Error('next start did not come up');
    await new Promise((r) => setTimeout(r, 250));
  }
}
