#!/usr/bin/env node
// `npm run bench [name…]`: runs bench/<name>.mjs (all of them when no name is given), one at a time.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const dir = path.resolve('bench');
const all = fs
  .readdirSync(dir)
  .filter((f) => f.endsWith('.mjs') && !['run.mjs', 'lib.mjs'].includes(f))
  .map((f) => f.replace(/\.mjs$/, ''));
const chosen = process.argv.slice(2).length ? process.argv.slice(2) : all;
let failed = 0;
for (const name of chosen) {
  console.log(`\n=== bench/${name}.mjs ===`);
  const r = spawnSync(process.execPath, [path.join(dir, `${name}.mjs`)], { stdio: 'inherit' });
  if (r.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
