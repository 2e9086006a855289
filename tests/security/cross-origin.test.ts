// Finding 2: a write from another origin (even a sibling on the same site, which SameSite=Lax
// cookies don't stop), or a text/plain body that a cross-site form can send without asking, made
// changes as the signed-in person. Now: 403 for another origin, 415 for a body that is not JSON.
import { beforeAll, describe, expect, it } from 'vitest';
import { api, baseUrl, countRows, makeCoopWithRoles } from '../support/api';

let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
const tanks = () => `/api/coops/${ctx.coop.slug}/tanks`;
const tankCount = () => countRows('tanks', 'coop_id = $1', [ctx.coop.id]);
const body = { name: 'Sneaky tank', capacity: '100' };

beforeAll(async () => {
  ctx = await makeCoopWithRoles();
});

describe('cross-origin writes', () => {
  it("a signed-in admin's request from another origin is refused with 403; nothing is written", async () => {
    const sibling = baseUrl().replace('127.0.0.1', 'localhost');
    for (const origin of ['http://evil.example', sibling, `${baseUrl()}.evil.example`, 'null']) {
      const res = await ctx.agents.admin.post(tanks()).set('Origin', origin).send(body);
      expect(res.status, origin).toBe(403);
    }
    expect(await tankCount()).toBe(0);
  });

  it("the text/plain body of an auto-submitting form is refused with 403 from another origin and 415 from the app's own", async () => {
    const json = JSON.stringify(body);
    const cross = await ctx.agents.admin
      .post(tanks())
      .set('Origin', 'http://evil.example')
      .set('Content-Type', 'text/plain')
      .send(json);
    expect(cross.status).toBe(403);
    const same = await ctx.agents.admin.post(tanks()).set('Content-Type', 'text/plain').send(json);
    expect(same.status).toBe(415);
    const form = await ctx.agents.admin.post(tanks()).type('form').send(body);
    expect(form.status).toBe(415);
    expect(await tankCount()).toBe(0);
  });

  it('without Origin only Sec-Fetch-Site: same-origin counts', async () => {
    const none = await ctx.agents.admin.post(tanks()).unset('Origin').send(body);
    expect(none.status).toBe(403);
    const sameSite = await ctx.agents.admin.post(tanks()).unset('Origin').set('Sec-Fetch-Site', 'same-site').send(body);
    expect(sameSite.status).toBe(403);
    expect(await tankCount()).toBe(0);
    const sameOrigin = await ctx.agents.admin
      .post(tanks())
      .unset('Origin')
      .set('Sec-Fetch-Site', 'same-origin')
      .send(body);
    expect(sameOrigin.status).toBe(201);
    expect(await tankCount()).toBe(1);
  });

  it('the unauthenticated password reset is guarded the same way', async () => {
    const res = await api()
      .post('/api/password-reset')
      .set('Origin', 'http://evil.example')
      .send({ email: 'someone@example.test' });
    expect(res.status).toBe(403);
  });

  it('an upload route takes only multipart; a JSON route takes no multipart', async () => {
    const up = await ctx.agents.admin.post(`/api/coops/${ctx.coop.slug}/batches/1/files`).send({ file: 'x' });
    expect([404, 415]).toContain(up.status);
    const multi = await ctx.agents.admin.post(tanks()).field('name', 'Multipart tank').field('capacity', '100');
    expect(multi.status).toBe(415);
    expect(await tankCount()).toBe(1);
  });

  it('the payments webhook is exempt (its signature is the check)', async () => {
    const res = await api()
      .post('/api/payments/webhook')
      .unset('Origin')
      .set('content-type', 'application/json')
      .send('{}');
    expect(res.status).toBe(400);
  });

  it('reads are not affected', async () => {
    const res = await ctx.agents.admin.get(tanks()).unset('Origin');
    expect(res.status).toBe(200);
  });
});
