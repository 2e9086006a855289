// Shared by the security tests: the route files on disk, and every table's row count.
import fs from 'node:fs';
import path from 'node:path';
import { sql } from '../support/api';

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/** Every exported method of every app/api/**\/route.ts, as "METHOD /api/path/[param]". */
export function routesOnDisk(): { method: Method; path: string }[] {
  const out: { method: Method; path: string }[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name === 'route.ts') {
        const src = fs.readFileSync(p, 'utf8');
        const route = '/' + path.relative(path.resolve('app'), path.dirname(p)).split(path.sep).join('/');
        for (const m of src.matchAll(/export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) out.push({ method: m[1] as Method, path: route });
      }
    }
  };
  walk(path.resolve('app/api'));
  return out.sort((a, b) => `${a.method} ${a.path}`.localeCompare(`${b.method} ${b.path}`));
}

/** Row counts of every table in the database, for "nothing was written" checks. */
export async function allRowCounts(): Promise<Record<string, number>> {
  const tables = await sql<{ t: string }>(`SELECT quote_ident(table_name) AS t FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`);
  const union = tables.map(({ t }) => `SELECT '${t}' AS t, count(*)::int AS n FROM ${t}`).join(' UNION ALL ');
  const rows = await sql<{ t: string; n: number }>(union);
  return Object.fromEntries(rows.map((r) => [r.t, r.n]));
}
