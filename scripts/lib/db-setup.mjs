// Runs sequelize-cli migrations (and optionally seeders) against DATABASE_URL.
import { spawnSync } from 'node:child_process';
import path from 'node:path';

const cli = path.resolve('node_modules', 'sequelize-cli', 'lib', 'sequelize');

function run(args, env) {
  const r = spawnSync(process.execPath, [cli, ...args], { env: { ...process.env, ...env }, encoding: 'utf8' });
  if (r.status !== 0) {
    throw new Error(`sequelize-cli ${args.join(' ')} failed:\n${r.stdout}\n${r.stderr}`);
  }
  return r.stdout;
}

/** Applies pending migrations, then (when seed is true) seeders that have not run yet. */
export function migrate({ databaseUrl, seed = false }) {
  const env = { DATABASE_URL: databaseUrl, NODE_ENV: 'production' };
  run(['db:migrate'], env);
  if (seed) run(['db:seed:all'], env);
}
