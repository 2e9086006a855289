// The worker's entry point (bundled by scripts/lib/worker-build.mjs, started by scripts/worker.mjs).
export { startWorker } from './worker';
