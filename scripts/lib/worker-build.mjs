// Compiles the worker (lib/jobs/worker.ts and the lib/ and models/ code it uses) into one ES
// module, .data/worker/worker.mjs, with rolldown (the bundler Vite uses). Packages stay external
// and load from node_modules, as in `next start`.
import fs from 'node:fs';
import path from 'node:path';

const OUT = path.resolve('.data', 'worker', 'worker.mjs');
const SOURCE_DIRS = ['lib', 'models'];

function newestSource() {
  let newest = 0;
  const walk = (dir) => {
    if (!fs.existsSync(dir)) return;
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else newest = Math.max(newest, fs.statSync(p).mtimeMs);
    }
  };
  for (const d of SOURCE_DIRS) walk(path.resolve(d));
  for (const f of ['package.json', 'package-lock.json'])
    if (fs.existsSync(f)) newest = Math.max(newest, fs.statSync(f).mtimeMs);
  return newest;
}

/** Builds the worker bundle when it is missing or older than lib/, models/ or the lock file; returns its path. */
export async function buildWorker({ log = console.log, force = false } = {}) {
  if (!force && fs.existsSync(OUT) && fs.statSync(OUT).mtimeMs >= newestSource()) return OUT;
  log('Building the worker…');
  const { build } = await import('rolldown');
  const root = path.resolve('.');
  const empty = path.resolve('scripts', 'lib', 'empty.mjs');
  await build({
    input: path.resolve('lib', 'jobs', 'main.ts'),
    platform: 'node',
    logLevel: 'warn',
    resolve: { alias: { '@': root, 'server-only': empty } },
    // Every package is loaded from node_modules at run time; only our own code is bundled.
    external: (id) =>
      !id.startsWith('.') &&
      !id.startsWith('/') &&
      !id.startsWith('@/') &&
      id !== 'server-only' &&
      !path.isAbsolute(id),
    output: { file: OUT, format: 'esm', sourcemap: true },
  });
  return OUT;
}
