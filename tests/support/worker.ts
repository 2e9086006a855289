// The job worker the integration tests run beside the server (started by global-setup.ts):
// kill it as a crash would, and start a replacement that serves the rest of the run.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { inject } from 'vitest';

const PID_FILE = path.resolve('.data', 'test', 'worker.pid');

/** Kills the running worker with SIGKILL (no chance to finish anything) and waits until it is gone. */
export async function killWorker(): Promise<void> {
  const pid = Number(fs.readFileSync(PID_FILE, 'utf8'));
  try {
    process.kill(pid, 'SIGKILL');
  } catch {
    return;
  }
  for (;;) {
    try {
      process.kill(pid, 0);
    } catch {
      return;
    }
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** Starts a new worker (detached, so it outlives this test file; global teardown stops it) and waits until it is ready. */
export async function startWorker(): Promise<void> {
  const env = { WORKER_PROCESSES: '1', ...(JSON.parse(inject('workerEnv')) as NodeJS.ProcessEnv) };
  const logFile = path.resolve('.data', 'test', 'worker.log');
  const readyCount = () =>
    fs.existsSync(logFile) ? fs.readFileSync(logFile, 'utf8').split('[worker] ready').length - 1 : 0;
  const before = readyCount();
  const log = fs.openSync(logFile, 'a');
  const child = spawn(process.execPath, [path.resolve('scripts', 'worker.mjs')], {
    env,
    stdio: ['ignore', log, log],
    detached: true,
  });
  child.unref();
  fs.closeSync(log);
  const deadline = Date.now() + 60_000;
  while (readyCount() <= before) {
    if (child.exitCode !== null || Date.now() > deadline) throw new Error(`the worker did not start; see ${logFile}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  fs.writeFileSync(PID_FILE, String(child.pid));
}

/**
 * Waits until the worker has handled every e-mail job queued so far (none waiting, retrying or
 * running), so a test can check that something sent nothing as well as that it sent something.
 */
export async function mailSettled(timeoutMs = 30_000): Promise<void> {
  const { sql } = await import('./api');
  const end = Date.now() + timeoutMs;
  for (;;) {
    const [r] = await sql<{ n: string }>(
      `SELECT count(*) AS n FROM pgboss.job WHERE name IN ('mail', 'mail-invoice', 'mail-invitation') AND state IN ('created', 'retry', 'active')`,
    );
    if (Number(r!.n) === 0) return;
    if (Date.now() > end) throw new Error('e-mail jobs still waiting');
    await new Promise((res) => setTimeout(res, 100));
  }
}
