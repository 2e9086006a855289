import { beforeAll, describe, expect, it } from 'vitest';
import { makeCoopWithRoles, sql } from '../support/api';

describe('audit log API', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    await sql(
      `INSERT INTO audit_events (coop_id, actor_user_id, action, entity_type, entity_id, before, after, created_at) VALUES
       ($1, $2, 'member.role', 'membership', '7', '{"role":"member"}', '{"role":"brewer"}', '2026-11-03T15:00:00Z'),
       ($1, $3, 'batch.release', 'batch', '12', NULL, '{"gallons":40}', '2026-11-20T15:00:00Z'),
       ($4, $2, 'member.role', 'membership', '9', NULL, NULL, '2026-11-04T15:00:00Z')`,
      [ctx.coop.id, ctx.users.admin.id, ctx.users.brewer.id, ctx.other.id],
    );
  });

  it('lists only this co-op’s events, newest first, with before and after', async () => {
    const res = await ctx.agents.admin.get(`/api/coops/${ctx.coop.slug}/audit`).expect(200);
    expect(res.body.rows.map((r: { action: string }) => r.action)).toEqual(['batch.release', 'member.role']);
    expect(res.body.rows[1]).toMatchObject({ before: { role: 'member' }, after: { role: 'brewer' }, entityId: '7' });
    expect(res.body.total).toBe(2);
  });

  it('filters by who, what and when', async () => {
    const byWho = await ctx.agents.admin
      .get(`/api/coops/${ctx.coop.slug}/audit?actor=${ctx.users.brewer.id}`)
      .expect(200);
    expect(byWho.body.rows.map((r: { action: string }) => r.action)).toEqual(['batch.release']);
    const byWhat = await ctx.agents.admin.get(`/api/coops/${ctx.coop.slug}/audit?action=member`).expect(200);
    expect(byWhat.body.rows.map((r: { action: string }) => r.action)).toEqual(['member.role']);
    const byWhen = await ctx.agents.admin
      .get(`/api/coops/${ctx.coop.slug}/audit?from=2026-11-10&to=2026-11-30`)
      .expect(200);
    expect(byWhen.body.rows.map((r: { action: string }) => r.action)).toEqual(['batch.release']);
  });

  it('rejects bad filters with the field and reason', async () => {
    const res = await ctx.agents.admin
      .get(`/api/coops/${ctx.coop.slug}/audit?from=2026-12-05&to=2026-12-01&page=0`)
      .expect(422);
    expect(Object.keys(res.body.fields).sort()).toEqual(['page', 'to']);
  });

  it('creating a co-op is audited', async () => {
    const slug = `audited-${Date.now().toString(36)}`;
    await ctx.agents.member.post('/api/coops').send({ name: 'Audited Fuel Circle', slug }).expect(201);
    const res = await ctx.agents.member.get(`/api/coops/${slug}/audit`).expect(200);
    expect(res.body.rows[0]).toMatchObject({ action: 'coop.create', after: { slug } });
  });
});
