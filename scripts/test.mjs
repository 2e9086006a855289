#!/usr/bin/env node
// `npm test`: builds the app when needed, then runs every vitest project (unit, then
// integration against a throw-away PostgreSQL and a real `next start`, both started by
// tests/support/global-setup.ts and stopped at the end). Extra arguments go to vitest.
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { buildIfNeeded } from './lib/build.mjs';

process.env.NEXT_TELEMETRY_DISABLED = '1';
try {
  buildIfNeeded({ log: (m) => console.log('[test]', m) });
} catch (e) {
  console.error(`[test] ${e.message}`);
  process.exit(1);
}
const vitest = path.resolve('node_modules', 'vitest', 'vitest.mjs');
const r = spawnSync(process.execPath, [vitest, 'run', ...process.argv.slice(2)], {
  stdio: 'inherit',
  env: process.env,
});
process.exit(r.status ?? 1);
