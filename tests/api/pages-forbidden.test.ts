import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, makeCoopWithRoles } from '../support/api';

// Pages answer the way the API does, through one guard (lib/auth/page.ts requirePageActor):
// a role that may not see a page gets 403 and the one forbidden page inside the co-op's
// navigation; a stranger to the co-op gets 404; no session goes to sign-in.
describe('pages a role may not see', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });

  const cases: [string, 'member' | 'treasurer' | 'brewer'][] = [
    ['reports', 'member'],
    ['audit', 'member'],
    ['settings', 'member'],
    ['settings', 'treasurer'],
    ['audit', 'treasurer'],
    ['billing', 'member'],
    ['billing/payments', 'brewer'],
    ['members', 'treasurer'],
    ['draws', 'member'],
  ];
  it.each(cases)('/%s as a %s → 403 with the forbidden page and the navigation', async (path, role) => {
    const res = await ctx.agents[role].get(`/c/${ctx.coop.slug}/${path}`);
    expect(res.status).toBe(403);
    expect(res.text).toContain('Not part of your role');
    expect(res.text).not.toContain('Something went wrong');
    expect(res.text).toContain(`/c/${ctx.coop.slug}/me`);
  });

  it('the roles that may see those pages get them (200)', async () => {
    for (const [path, role] of [['reports', 'treasurer'], ['audit', 'admin'], ['settings', 'admin'], ['billing', 'treasurer'], ['draws', 'brewer']] as const) {
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
