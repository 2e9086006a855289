// The route handlers on disk (pure: no server, no database), for tests generated from the route files.
import fs from 'node:fs';
import path from 'node:path';

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
        for (const m of src.matchAll(/export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g))
          out.push({ method: m[1] as Method, path: route });
      }
    }
  };
  walk(path.resolve('app/api'));
  return out.sort((a, b) => `${a.method} ${a.path}`.localeCompare(`${b.method} ${b.path}`));
}
