// `next build` when the build is missing or older than any source file.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const SOURCE_DIRS = ['app', 'components', 'lib', 'models', 'fonts'];
const SOURCE_FILES = [
  'instrumentation.ts',
  'proxy.ts',
  'package.json',
  'package-lock.json',
  'next.config.mjs',
  'tailwind.config.ts',
  'postcss.config.mjs',
  'tsconfig.json',
];

export function needsBuild() {
  const id = path.resolve('.next', 'BUILD_ID');
  if (!fs.existsSync(id)) return true;
  const built = fs.statSync(id).mtimeMs;
  const newer = (dir) => {
    if (!fs.existsSync(dir)) return false;
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory() ? newer(p) : fs.statSync(p).mtimeMs > built) return true;
    }
    return false;
  };
  return (
    SOURCE_DIRS.some((d) => newer(path.resolve(d))) ||
    SOURCE_FILES.some((f) => fs.existsSync(f) && fs.statSync(f).mtimeMs > built)
  );
}

export function buildIfNeeded({ env = process.env, log = console.log, force = false } = {}) {
  if (!force && !needsBuild()) return;
  log('Building the app (next build, about a minute on 2 cores)…');
  const nextBin = path.resolve('node_modules', 'next', 'dist', 'bin', 'next');
  const r = spawnSync(process.execPath, [nextBin, 'build'], {
    env: { ...env, NEXT_TELEMETRY_DISABLED: '1' },
    stdio: 'inherit',
  });
  if (r.status !== 0) throw new Error('next build failed');
}
