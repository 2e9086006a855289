#!/usr/bin/env node
// `npm run worker`: runs the background jobs (e-mail, billing-run chunks, reservation expiry,
// payment settling, housekeeping) against DATABASE_URL. `npm start` and the tests start one
// beside the Next server; a deployment may run as many as it likes, on other machines too.
// SIGTERM/SIGINT let running jobs finish (up to 20 s); a worker killed outright loses nothing.
import { pathToFileURL } from 'node:url';
import { buildWorker } from './lib/worker-build.mjs';

if (!process.env.DATABASE_URL) {
  console.error('[worker] DATABASE_URL is not set.');
  process.exit(1);
}
const file = await buildWorker({ log: (m) => console.log('[worker]', m) });
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
