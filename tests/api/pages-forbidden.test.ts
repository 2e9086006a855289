import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { can, type Action } from '@/lib/auth/policies';
import { ROLES, type Role } from '@/models/vocabulary';
import { baseUrl, makeCoopWithRoles } from '../support/api';

const COOP_DIR = path.resolve('app', 'c', '[coop]');
const guardOf = (file: string) =>
  /(?:sectionGuard|requirePageActor)\((?:coop, )?'([a-z-]+:[a-z-]+)'/.exec(
    fs.existsSync(file) ? fs.readFileSync(file, 'utf8') : '',
  )?.[1] as Action | undefined;

/** Every page under app/c/[coop] with the action that guards it (the nearest guard layout's, else the page's own). */
function pageActions(): { path: string; action: Action }[] {
  const out: { path: string; action: Action }[] = [];
  const walk = (dir: string, rel: string[], inherited: Action | undefined) => {
    const guard = guardOf(path.join(dir, 'layout.tsx')) ?? inherited;
    const page = path.join(dir, 'page.tsx');
    if (fs.existsSync(page)) {
      const action = guard ?? guardOf(page);
      if (!action) throw new Error(`${page} asks no requirePageActor`);
      out.push({
        path: rel.map((s) => (s === '[period]' ? '2026-11' : s.startsWith('[') ? '1' : s)).join('/'),
        action,
      });
    }
    for (const e of fs.readdirSync(dir, { withFileTypes: true }))
      if (e.isDirectory()) walk(path.join(dir, e.name), [...rel, e.name], guard);
  };
  walk(COOP_DIR, [], undefined);
  return out;
}

// Pages answer the way the API does, through one guard (lib/auth/page.ts requirePageActor):
// a role that may not see a page gets status 403 (a section's layout.tsx refuses before anything
// streams) and, in the browser, the one forbidden page inside the co-op's navigation; a stranger to the co-op
// gets 404; no session goes to sign-in. tests/e2e/forbidden.test.ts looks at it in a browser.
describe('pages a role may not see', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });

  // Generated from app/c/[coop]/**/page.tsx: each page's action is the one its section's guard
  // layout (sectionGuard) or the page itself (requirePageActor) asks for; every role the policy
  // table leaves out of it must be refused. Path ids are placeholders: the guard answers first.
  const pages = pageActions();
  const cases = pages.flatMap(({ path, action }) =>
    ROLES.filter((r) => r !== 'admin' && !can(r, action)).map((role) => [path, role, action] as const),
  );
  it('finds the co-op’s pages and their actions', () => {
    expect(pages.length).toBeGreaterThan(15);
    expect(cases.length).toBeGreaterThan(10);
  });
  it.each(cases)(
    '/%s as a %s (needs %s) → 403 and the forbidden page inside the co-op’s navigation',
    async (path, role) => {
      const res = await ctx.agents[role as Exclude<Role, 'admin'>].get(`/c/${ctx.coop.slug}/${path}`);
      // The status line says 403; the page inside the navigation is drawn from the payload by the
      // browser (the forbidden boundary), which tests/e2e/forbidden.test.ts checks on screen.
      expect(res.status).toBe(403);
      expect(res.text).not.toContain('Something went wrong');
    },
  );

  it('the roles that may see those pages get them (200)', async () => {
    for (const [path, role] of [
      ['reports', 'treasurer'],
      ['audit', 'admin'],
      ['settings', 'admin'],
      ['billing', 'treasurer'],
      ['draws', 'brewer'],
    ] as const) {
      const res = await ctx.agents[role].get(`/c/${ctx.coop.slug}/${path}`);
      expect(res.status, `${role} on ${path}`).toBe(200);
      expect(res.text).not.toContain('Not part of your role');
    }
  });

  it('another co-op’s admin gets 404; no session goes to sign-in', async () => {
    expect((await ctx.agents.outsider.get(`/c/${ctx.coop.slug}/reports`)).status).toBe(404);
    const anon = await request(baseUrl()).get(`/c/${ctx.coop.slug}/reports`);
    expect([303, 307, 308]).toContain(anon.status);
    expect(anon.headers.location).toContain('/sign-in');
  });
});
