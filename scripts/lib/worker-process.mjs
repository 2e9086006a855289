// Starts the job worker (scripts/worker.mjs) as a child process beside the Next server, with
// the same environment. Used by the start script and the tests.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { stopChild } from './app.mjs';
import { buildWorker } from './worker-build.mjs';

/**
 * Starts a worker and resolves once it is ready (it prints "[worker] ready").
 * @param {{env: object, stdio?: any, log?: (m: string) => void, nodeArgs?: string[]}} o
 * @returns {Promise<{child: import('node:child_process').ChildProcess, stop: () => Promise<void>}>}
 */
export async function startWorkerProcess(o) {
  await buildWorker({ log: o.log ?? (() => {}) });
  // One process beside the Next server unless told otherwise (`npm run worker` alone takes one per core).
  const env = { WORKER_PROCESSES: '1', ...o.env };
  const child = spawn(process.execPath, [...(o.nodeArgs ?? []), path.resolve('scripts', 'worker.mjs')], {
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const out = o.stdio ?? process.stdout;
  child.stdout.pipe(out, { end: false });
  child.stderr.pipe(o.stdio ?? process.stderr, { end: false });
  await new Promise((resolve, reject) => {
    let seen = '';
    const onData = (b) => {
      seen += b.toString();
      if (seen.includes('[worker] ready')) {
        child.stdout.off('data', onData);
        resolve();
      }
    };
    child.stdout.on('data', onData);
    child.once('exit', (code) => reject(new Error(`the worker exited (${code}) before it was ready`)));
  });
  // SIGTERM lets running jobs finish; a worker that does not end in time is killed (its jobs are retried).
  const stop = () => stopChild(child, 10_000);
  return { child, stop };
}
