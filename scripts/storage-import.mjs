#!/usr/bin/env node
// `npm run storage:import [-- <folder>]`: moves the files of a local upload folder (the former
// STORAGE_DIR, default .data/uploads) into the object store named by S3_* (lib/storage/s3.ts),
// under the same keys, then checks that every file the database refers to is in the bucket.
// Idempotent: run it again after a partial run. Needs DATABASE_URL and S3_BUCKET.
// Exit code 0 when every referenced file is in the bucket, 2 when some are missing.
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { buildWorker } from './lib/worker-build.mjs';

const dir = path.resolve(process.argv[2] ?? process.env.STORAGE_DIR ?? '.data/uploads');
for (const name of ['DATABASE_URL', 'S3_BUCKET']) {
  if (!process.env[name]) {
    console.error(`[storage-import] ${name} is not set.`);
    process.exit(1);
  }
}
if (!fs.existsSync(dir))
  console.log(`[storage-import] ${dir} does not exist; only checking the bucket against the database.`);
const bundle = await buildWorker({ log: (m) => console.log('[storage-import]', m) });
const { importLocalFolder } = await import(pathToFileURL(bundle).href);
const report = await importLocalFolder(dir, (m) => console.log('[storage-import]', m));
for (const k of report.missing) console.error(`[storage-import] missing: ${k}`);
process.exit(report.missing.length ? 2 : 0);
