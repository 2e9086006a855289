// Architecture rules of the data layer (issue 11), checked by reading the source tree. No
// database: these are text rules, kept simple on purpose so a failure is easy to read.
//
// 1. Raw SQL goes through `sequelize.query` (with `bind`) only in `lib/**/queries.ts`, and in `models/`, `migrations/`, `seeders/`. The rule looks for the
//    text `sequelize.query` (which also covers `queryInterface.sequelize.query`) outside comments.
//    The test harness (tests/support/api.ts `sql`) and the benchmarks (bench/lib.mjs `dbPool`)
//    arrange rows through their own Sequelize instance (`db().query`), which is not app code.
// 2. Only `lib/db.ts` imports `pg` (it hands it to Sequelize as its dialect module); everything
//    else, tests and benchmarks included, reaches PostgreSQL through Sequelize.
// 3. Nothing imports the removed layers: `statement`, `queryRows`, `queryRowSets`, `runReadPlan`,
//    `ReadPlan` from `lib/db`, or anything from `lib/billing/db`.
// 4. `models/` imports nothing from `lib/` except `@/lib/db` (the Sequelize instance).
// 5. No import cycles among app/, components/, lib/ and models/; components/ never import models/.
// 6. No source file of app/, components/, lib/, models/, scripts/ or bench/ over 400 lines (the
//    generated API client types excepted).
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = path.resolve(import.meta.dirname, '..', '..');
const FOLDERS = ['app', 'lib', 'components', 'models', 'migrations', 'seeders', 'scripts', 'tests', 'bench'];
const SKIP = new Set(['node_modules', '.next', '.data']);
const SOURCE = /\.(?:[cm]?[jt]s|[jt]sx)$/;
const SELF = path
  .relative(ROOT, import.meta.filename)
  .split(path.sep)
  .join('/');

/** Every source file of the project (the folders above and the root's config files), as root-relative paths with `/`. */
function sourceFiles(): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      if (SKIP.has(e.name)) continue;
      const full = path.join(dir, e.name);
      if (e.isDirectory()) walk(full);
      else if (SOURCE.test(e.name)) out.push(path.relative(ROOT, full).split(path.sep).join('/'));
    }
  };
  for (const f of FOLDERS) if (fs.existsSync(path.join(ROOT, f))) walk(path.join(ROOT, f));
  for (const e of fs.readdirSync(ROOT, { withFileTypes: true }))
    if (e.isFile() && SOURCE.test(e.name)) out.push(e.name);
  return out.filter((f) => f !== SELF).sort();
}

/** The text without `/* … *\/` and `// …` comments (naive about comment markers inside strings; good enough for these rules). */
const withoutComments = (text: string) => text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`\\])\/\/.*$/gm, '$1');

const files = sourceFiles();
const code = new Map(files.map((f) => [f, withoutComments(fs.readFileSync(path.join(ROOT, f), 'utf8'))]));

/** Each import/export/require of a module: the names taken (for `{ … }` imports) and the root-relative path it resolves to (or the bare name). */
function importsOf(file: string): { spec: string; target: string; names: string[] }[] {
  const text = code.get(file)!;
  const found: { spec: string; names: string }[] = [];
  for (const m of text.matchAll(/\b(?:import|export)\s+(?:type\s+)?([\s\S]*?)\s+from\s+['"]([^'"]+)['"]/g))
    found.push({ spec: m[2]!, names: m[1]! });
  for (const m of text.matchAll(/\b(?:import|require)\s*\(\s*['"]([^'"]+)['"]\s*\)/g))
    found.push({ spec: m[1]!, names: '*' });
  for (const m of text.matchAll(/^\s*import\s+['"]([^'"]+)['"]/gm)) found.push({ spec: m[1]!, names: '' });
  return found.map(({ spec, names }) => {
    let target = spec;
    if (spec.startsWith('@/')) target = spec.slice(2);
    else if (spec.startsWith('.'))
      target = path
        .relative(ROOT, path.resolve(ROOT, path.dirname(file), spec))
        .split(path.sep)
        .join('/');
    target = target.replace(/\.(?:[cm]?[jt]s|[jt]sx)$/, '').replace(/\/index$/, '');
    const braces = /\{([\s\S]*)\}/.exec(names)?.[1];
    const list =
      braces === undefined
        ? []
        : braces
            .split(',')
            .map((n) =>
              n
                .trim()
                .replace(/^type\s+/, '')
                .split(/\s+as\s+/)[0]!
                .trim(),
            )
            .filter(Boolean);
    return { spec, target, names: list };
  });
}

const RAW_SQL_ALLOWED = (f: string) =>
  /^(?:models|migrations|seeders)\//.test(f) || /^lib\/(?:.+\/)?queries\.ts$/.test(f);

const REMOVED_DB_NAMES = new Set(['statement', 'queryRows', 'queryRowSets', 'runReadPlan', 'ReadPlan']);

describe('architecture: one data layer through Sequelize', () => {
  it('finds the source tree', () => {
    expect(files).toContain('lib/db.ts');
    expect(files.length).toBeGreaterThan(100);
  });

  it('calls sequelize.query only in models/, migrations/, seeders/ and lib/**/queries.ts', () => {
    const offenders = files.filter((f) => !RAW_SQL_ALLOWED(f) && /\bsequelize\s*\.\s*query\s*[(<]/.test(code.get(f)!));
    expect(
      offenders,
      `raw SQL outside a queries file (move it into lib/<domain>/queries.ts, or use a model):\n  ${offenders.join('\n  ')}\n`,
    ).toEqual([]);
  });

  it('imports pg only in lib/db.ts', () => {
    const offenders = files.filter(
      (f) => f !== 'lib/db.ts' && importsOf(f).some((i) => i.spec === 'pg' || i.spec.startsWith('pg/')),
    );
    expect(
      offenders,
      `files importing pg (reach the database through Sequelize instead):\n  ${offenders.join('\n  ')}\n`,
    ).toEqual([]);
  });

  it('uses none of the removed helpers: statement/queryRows/queryRowSets/runReadPlan/ReadPlan from lib/db, or lib/billing/db', () => {
    const offenders = files.flatMap((f) =>
      importsOf(f).flatMap((i) => {
        if (i.target === 'lib/billing/db') return [`${f}: imports lib/billing/db`];
        if (i.target !== 'lib/db') return [];
        const bad = i.names.filter((n) => REMOVED_DB_NAMES.has(n));
        return bad.length ? [`${f}: imports ${bad.join(', ')} from lib/db`] : [];
      }),
    );
    expect(offenders, `removed data-layer helpers still in use:\n  ${offenders.join('\n  ')}\n`).toEqual([]);
  });

  it('models/ imports nothing from lib/ except lib/db', () => {
    const offenders = files
      .filter((f) => f.startsWith('models/'))
      .flatMap((f) =>
        importsOf(f)
          .filter((i) => i.target.startsWith('lib/') && i.target !== 'lib/db')
          .map((i) => `${f}: imports ${i.spec}`),
      )
      .filter((line, i, all) => all.indexOf(line) === i);
    expect(offenders, `models reaching into lib/:\n  ${offenders.join('\n  ')}\n`).toEqual([]);
  });
});

/** Generated by `npm run api:types` from the OpenAPI document (not written by hand). */
const GENERATED_API_TYPES = 'lib/api/client/types.ts';

/** Module key of a source file, as importsOf() writes targets: no extension, no trailing /index. */
const moduleKey = (f: string) => f.replace(/\.(?:[cm]?[jt]s|[jt]sx)$/, '').replace(/\/index$/, '');

/** Import cycles among app/, components/, lib/ and models/ (type-only imports included: a cycle of types is still a tangle), each once. */
function importCycles(): string[][] {
  const inScope = files.filter((f) => /^(?:app|components|lib|models)\//.test(f));
  const byKey = new Map(inScope.map((f) => [moduleKey(f), f]));
  const edges = new Map(
    inScope.map((f) => [
      f,
      [
        ...new Set(
          importsOf(f)
            .map((i) => byKey.get(i.target))
            .filter((t): t is string => !!t && t !== f),
        ),
      ],
    ]),
  );
  // Tarjan's strongly connected components: every component of more than one file holds a cycle.
  let index = 0;
  const idx = new Map<string, number>(),
    low = new Map<string, number>(),
    onStack = new Set<string>(),
    stack: string[] = [],
    out: string[][] = [];
  const visit = (v: string) => {
    idx.set(v, index);
    low.set(v, index);
    index++;
    stack.push(v);
    onStack.add(v);
    for (const w of edges.get(v) ?? []) {
      if (!idx.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, idx.get(w)!));
    }
    if (low.get(v) === idx.get(v)) {
      const comp: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        comp.push(w);
      } while (w !== v);
      if (comp.length > 1) out.push(comp.sort());
    }
  };
  for (const f of inScope) if (!idx.has(f)) visit(f);
  return out;
}

describe('architecture: layers', () => {
  it('has no import cycles among app/, components/, lib/ and models/ (dynamic and type imports included)', () => {
    const cycles = importCycles();
    expect(
      cycles,
      `files importing each other, directly or round a loop (move the shared part into a module both import):\n  ${cycles.map((c) => c.join(' ↔ ')).join('\n  ')}\n`,
    ).toEqual([]);
  });

  it('keeps every source file of app/, components/, lib/, models/, scripts/ and bench/ at 400 lines or fewer', () => {
    const long = files
      .filter((f) => /^(?:app|components|lib|models|scripts|bench)\//.test(f) && f !== GENERATED_API_TYPES)
      .map((f) => ({ f, lines: fs.readFileSync(path.join(ROOT, f), 'utf8').split('\n').length - 1 }))
      .filter((x) => x.lines > 400)
      .map((x) => `${x.f}: ${x.lines} lines`);
    expect(long, `files over 400 lines (split them by what they do):\n  ${long.join('\n  ')}\n`).toEqual([]);
  });

  it('components/ import nothing from models/ (they get DTOs from lib/ or the API)', () => {
    const offenders = files
      .filter((f) => f.startsWith('components/'))
      .flatMap((f) =>
        importsOf(f)
          .filter((i) => i.target === 'models' || i.target.startsWith('models/'))
          .map((i) => `${f}: imports ${i.spec}`),
      );
    expect(offenders, `components reaching into models/:\n  ${offenders.join('\n  ')}\n`).toEqual([]);
  });
});
