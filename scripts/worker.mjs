#!/usr/bin/env node
// `npm run worker`: runs the background jobs (e-mail, billing-run chunks, reservation expiry,
// payment settling, housekeeping) against DATABASE_URL. `npm start` and the tests start one
// beside the Next server; a deployment may run as many as it likes, on other machines too.
// WORKER_PROCESSES=n runs n worker processes from this one (PDF rendering for invoice e-mails is
// CPU-bound: the default is one per core; `npm start` and the tests, which share the machine with
// the Next server, start one — scripts/lib/worker-process.mjs). SIGTERM/SIGINT let running jobs finish (up to 20 s); a
// worker killed outright loses nothing (its jobs are taken again within seconds).
import { fork } from 'node:child_process';
import os from 'node:os';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { buildWorker } from './lib/worker-build.mjs';

if (!process.env.DATABASE_URL) {
  console.error('[worker] DATABASE_URL is not set.');
  process.exit(1);
}
const file = await buildWorker({ log: (m) => console.log('[worker]', m) });
const processes = process.env.WORKER_CHILD
  ? 1
  : Math.max(1, Number(process.env.WORKER_PROCESSES ?? os.availableParallelism()));

if (processes > 1) {
  const children = Array.from({ length: processes }, () =>
    fork(fileURLToPath(import.meta.url), {
      env: { ...process.env, WORKER_CHILD: '1' },
      stdio: ['ignore', 'pipe', 'inherit', 'ipc'],
    }),
  );
  let ready = 0;
  for (const c of children) {
    c.stdout.on('data', (b) => {
      const s = b.toString();
      // One "ready" for the group, once every process is ready.
      if (s.includes('[worker] ready')) {
        if (++ready === processes) console.log(`[worker] ready (${processes} processes)`);
        const rest = s.replace('[worker] ready\n', '');
        if (rest) process.stdout.write(rest);
      } else process.stdout.write(s);
    });
    c.on('exit', (code) => {
      if (!stopping) {
        console.error(`[worker] a worker process exited (${code}); stopping the others`);
        stop(1);
      }
    });
  }
  let stopping = false;
  const stop = async (code = 0) => {
    if (stopping) return;
    stopping = true;
    await Promise.all(
      children.map(
        (c) =>
          new Promise((r) =>
            c.exitCode !== null || c.signalCode !== null ? r() : (c.once('exit', r), c.kill('SIGTERM')),
          ),
      ),
    );
    process.exit(code);
  };
  process.on('SIGTERM', () => stop(0));
  process.on('SIGINT', () => stop(0));
} else {
  const { startWorker } = await import(pathToFileURL(file).href);
  const worker = await startWorker();
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    console.log('[worker] stopping…');
    await worker.stop().catch((e) => console.error(e));
    process.exit(0);
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
  // A child whose parent died (even by SIGKILL) stops too, instead of working on unsupervised.
  if (process.env.WORKER_CHILD) process.on('disconnect', stop);
}
