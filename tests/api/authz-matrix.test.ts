// The authorization matrix, generated from the route handlers on disk: every exported method of
// every app/api/**/route.ts must be listed in tests/api/matrix/*.ts, and each listed route is
// called with no session, with each role, and as a member of another co-op.
import fs from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../support/api';
import { api, makeCoopWithRoles } from '../support/api';
import type { RouteSpec } from './matrix/types';
import { routesOnDisk as routeFilesOnDisk } from '../security/helpers';

const matrixDir = path.resolve('tests/api/matrix');
const specs: RouteSpec[] = [];
for (const f of fs.readdirSync(matrixDir).filter((f) => f.endsWith('.ts') && f !== 'types.ts')) {
  specs.push(...((await import(path.join(matrixDir, f))) as { routes: RouteSpec[] }).routes);
}

/** Every exported method of every route file, as "METHOD /api/path". */
const routesOnDisk = () =>
  routeFilesOnDisk()
    .map((r) => `${r.method} ${r.path}`)
    .sort();

const key = (s: RouteSpec) => `${s.method} ${s.path}`;

describe('authorization matrix', () => {
  it('lists every route handler method on disk, and nothing that is not there', () => {
    const onDisk = routesOnDisk();
    const listed = specs.map(key).sort();
    expect(
      onDisk.filter((r) => !listed.includes(r)),
      'routes missing from tests/api/matrix',
    ).toEqual([]);
    expect(
      listed.filter((r) => !onDisk.includes(r)),
      'matrix entries without a route',
    ).toEqual([]);
  });

  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });

  const url = (s: RouteSpec, coopSlug: string) =>
    s.path.replace(/\[([^\]]+)\]/g, (_m, name: string) =>
      name === 'coop' ? coopSlug : (s.params?.[name] ?? '999999999'),
    );

  const send = (
    agent: ReturnType<typeof api> | Awaited<ReturnType<typeof makeCoopWithRoles>>['agents']['admin'],
    s: RouteSpec,
    coopSlug: string,
  ) => {
    const m = s.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
    const req = agent[m](url(s, coopSlug));
    return s.body === undefined ? req : req.send(s.body as object);
  };

  for (const s of specs) {
    describe(key(s), () => {
      if (s.scope === 'public') {
        it('answers without a session', async () => {
          const res = await send(api(), s, 'x');
          expect([401, 403]).not.toContain(res.status);
        });
        return;
      }
      it('no session → 401', async () => {
        const res = await send(api(), s, ctx.coop.slug);
        expect(res.status).toBe(401);
      });
      if (s.scope === 'user') return;
      it('member of another co-op → 404', async () => {
        const res = await send(ctx.agents.outsider, s, ctx.coop.slug);
        expect(res.status).toBe(404);
      });
      const hasIdParam = /\[(?!coop\])[^\]]+\]/.test(s.path);
      for (const role of ['admin', 'treasurer', 'brewer', 'member'] as Role[]) {
        const allowed = s.allow?.includes(role) ?? false;
        it(`${role} → ${allowed ? 'passes authorization' : '403'}`, async () => {
          const res = await send(ctx.agents[role], s, ctx.coop.slug);
          if (!allowed) expect(res.status).toBe(403);
          else {
            expect([401, 403]).not.toContain(res.status);
            if (!hasIdParam) expect(res.status).not.toBe(404);
            expect(res.status).toBeLessThan(500);
          }
        });
      }
    });
  }
});
