// The worker's entry point (bundled by scripts/lib/worker-build.mjs, started by scripts/worker.mjs).
export { startWorker } from './worker';
// One-off operations that reuse the same bundle (scripts/storage-import.mjs, scripts/user-create.mjs).
export { importLocalFolder } from '@/lib/storage/import';
export { accountSetupLink } from '@/lib/account/first-person';
