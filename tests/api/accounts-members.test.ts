// Members screen API: list with filters, role changes, suspension, removal, the last-admin rule,
// audit before/after, and that changes reach an already-signed-in person on their next request.
import { beforeAll, describe, expect, it } from 'vitest';
import { api, countRows, makeCoop, makeCoopWithRoles, makeUser, signIn, sql } from '../support/api';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;

const members = (slug: string) => `/api/coops/${slug}/members`;

async function membership(id: number) {
  const [m] = await sql<{ role: string; status: string }>('SELECT role, status FROM memberships WHERE id = $1', [id]);
  return m;
}

describe('GET /api/coops/[coop]/members', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    await makeUser({ coopId: ctx.coop.id, role: 'member', status: 'suspended', name: 'Odalys Quill' });
    await makeUser({ coopId: ctx.coop.id, role: 'brewer', name: 'Percival 50%_Off' });
  });

  it('lists every member with name, e-mail, role, status and joined date, sorted by name by default', async () => {
    const res = await ctx.agents.admin.get(members(ctx.coop.slug)).expect(200);
    expect(res.body.total).toBe(6);
    expect(res.body.rows).toHaveLength(6);
    const row = res.body.rows.find((r: { email: string }) => r.email === ctx.users.treasurer.email);
    expect(row).toMatchObject({ role: 'treasurer', status: 'active', id: ctx.users.treasurer.membershipId });
    expect(Date.parse(row.joinedAt)).not.toBeNaN();
    const names = res.body.rows.map((r: { name: string }) => r.name.toLowerCase());
    expect(names).toEqual([...names].sort());
    // The outsider (another co-op) is not listed.
    expect(res.body.rows.map((r: { email: string }) => r.email)).not.toContain(ctx.users.outsider.email);
    expect(res.body.activeAdmins).toBe(1);
  });

  it('filters by role, status and a search over name and e-mail on the server', async () => {
    const brewers = await ctx.agents.admin.get(members(ctx.coop.slug)).query({ role: 'brewer' }).expect(200);
    expect(brewers.body.rows.map((r: { role: string }) => r.role)).toEqual(['brewer', 'brewer']);
    const suspended = await ctx.agents.admin.get(members(ctx.coop.slug)).query({ status: 'suspended' }).expect(200);
    expect(suspended.body.rows.map((r: { name: string }) => r.name)).toEqual(['Odalys Quill']);
    const byName = await ctx.agents.admin.get(members(ctx.coop.slug)).query({ q: 'odaLYS' }).expect(200);
    expect(byName.body.total).toBe(1);
    const byEmail = await ctx.agents.admin
      .get(members(ctx.coop.slug))
      .query({ q: ctx.users.member.email.slice(0, 12) })
      .expect(200);
    expect(byEmail.body.rows.map((r: { email: string }) => r.email)).toContain(ctx.users.member.email);
    // LIKE wildcards are searched literally: "50%_" matches only the name that contains it.
    const literal = await ctx.agents.admin.get(members(ctx.coop.slug)).query({ q: '50%_' }).expect(200);
    expect(literal.body.rows.map((r: { name: string }) => r.name)).toEqual(['Percival 50%_Off']);
    const blank = await ctx.agents.admin.get(members(ctx.coop.slug)).query({ role: '', status: '', q: '' }).expect(200);
    expect(blank.body.total).toBe(6);
  });

  it('sorts and pages on the server', async () => {
    const p1 = await ctx.agents.admin
      .get(members(ctx.coop.slug))
      .query({ sort: 'role', dir: 'asc', pageSize: 2, page: 1 })
      .expect(200);
    const p2 = await ctx.agents.admin
      .get(members(ctx.coop.slug))
      .query({ sort: 'role', dir: 'asc', pageSize: 2, page: 2 })
      .expect(200);
    expect(p1.body.total).toBe(6);
    expect(p1.body.rows.map((r: { role: string }) => r.role)).toEqual(['admin', 'treasurer']);
    expect(p2.body.rows.map((r: { role: string }) => r.role)).toEqual(['brewer', 'brewer']);
    const past = await ctx.agents.admin.get(members(ctx.coop.slug)).query({ pageSize: 2, page: 9 }).expect(200);
    expect(past.body).toMatchObject({ rows: [], total: 6 });
  });

  it('refuses unknown filters and sorts with 422 naming the field', async () => {
    const res = await ctx.agents.admin
      .get(members(ctx.coop.slug))
      .query({ role: 'chief', sort: 'password', q: 'x'.repeat(101) })
      .expect(422);
    expect(Object.keys(res.body.fields).sort()).toEqual(['q', 'role', 'sort']);
    expect(res.body.fields.role[0]).toMatch(/admin, treasurer, brewer, member/);
  });
});

describe('PATCH and DELETE /api/coops/[coop]/members/[id]', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
  });
  const url = (id: number | undefined) => `${members(ctx.coop.slug)}/${id}`;

  it('changes a role and writes the change to the audit log with before and after', async () => {
    const id = ctx.users.member.membershipId!;
    const res = await ctx.agents.admin.patch(url(id)).send({ role: 'brewer' }).expect(200);
    expect(res.body).toMatchObject({ id, role: 'brewer', status: 'active', email: ctx.users.member.email });
    expect(await membership(id)).toEqual({ role: 'brewer', status: 'active' });
    const [event] = await sql<{ action: string; actor_user_id: number; before: object; after: object }>(
      `SELECT action, actor_user_id, before, after FROM audit_events WHERE coop_id = $1 AND entity_type = 'membership' AND entity_id = $2 ORDER BY id DESC LIMIT 1`,
      [ctx.coop.id, String(id)],
    );
    expect(event).toMatchObject({
      action: 'membership.role-change',
      actor_user_id: ctx.users.admin.id,
      before: { role: 'member', status: 'active', userId: ctx.users.member.id },
      after: { role: 'brewer', status: 'active', userId: ctx.users.member.id },
    });
    await ctx.agents.admin.patch(url(id)).send({ role: 'member' }).expect(200);
  });

  it('suspends and reinstates, each audited', async () => {
    const id = ctx.users.brewer.membershipId!;
    await ctx.agents.admin.patch(url(id)).send({ status: 'suspended' }).expect(200);
    expect(await membership(id)).toEqual({ role: 'brewer', status: 'suspended' });
    await ctx.agents.admin.patch(url(id)).send({ status: 'active' }).expect(200);
    expect(await membership(id)).toEqual({ role: 'brewer', status: 'active' });
    const actions = await sql<{ action: string }>(
      `SELECT action FROM audit_events WHERE coop_id = $1 AND entity_id = $2 ORDER BY id`,
      [ctx.coop.id, String(id)],
    );
    expect(actions.map((a) => a.action)).toEqual(['membership.suspend', 'membership.reinstate']);
  });

  it('refuses bad input with 422 per field and writes nothing', async () => {
    const id = ctx.users.treasurer.membershipId!;
    const auditBefore = await countRows('audit_events', 'coop_id = $1', [ctx.coop.id]);
    const cases: [unknown, string[]][] = [
      [{}, ['role']],
      [{ role: 'chief' }, ['role']],
      [{ role: 7 }, ['role']],
      [{ status: 'banned' }, ['status']],
      [{ role: 'admin', coopId: ctx.other.id }, ['coopId']],
      [{ role: 'admin', userId: ctx.users.outsider.id }, ['userId']],
    ];
    for (const [body, fields] of cases) {
      const res = await ctx.agents.admin
        .patch(url(id))
        .send(body as object)
        .expect(422);
      expect(Object.keys(res.body.fields), JSON.stringify(body)).toEqual(fields);
      expect(res.body.fields[fields[0]!][0]).toEqual(expect.any(String));
    }
    const notJson = await ctx.agents.admin
      .patch(url(id))
      .set('content-type', 'application/json')
      .send('{role:')
      .expect(400);
    expect(notJson.body.error).toMatch(/JSON/);
    expect(await membership(id)).toEqual({ role: 'treasurer', status: 'active' });
    expect(await countRows('audit_events', 'coop_id = $1', [ctx.coop.id])).toBe(auditBefore);
  });

  it('answers 404 for a membership of another co-op (matched by id AND co-op), changing nothing', async () => {
    const otherAdmin = ctx.users.outsider; // admin of ctx.other
    const res = await ctx.agents.outsider
      .patch(`${members(ctx.other.slug)}/${ctx.users.member.membershipId}`)
      .send({ role: 'admin' })
      .expect(404);
    expect(res.body.error).toMatch(/not in this co-op/);
    await ctx.agents.outsider.delete(`${members(ctx.other.slug)}/${ctx.users.member.membershipId}`).expect(404);
    expect(await membership(ctx.users.member.membershipId!)).toEqual({ role: 'member', status: 'active' });
    expect(otherAdmin.membershipId).toBeDefined();
    await ctx.agents.admin
      .patch(`${members(ctx.coop.slug)}/not-a-number`)
      .send({ role: 'admin' })
      .expect(404);
  });

  it('removes a member (audited); the removed person gets 404 on their next request', async () => {
    const gone = await makeUser({ coopId: ctx.coop.id, role: 'admin', name: 'Leaving Admin' });
    const goneAgent = await signIn(gone.email);
    await goneAgent.get(members(ctx.coop.slug)).expect(200);
    const res = await ctx.agents.admin.delete(url(gone.membershipId)).expect(200);
    expect(res.body).toEqual({ removed: true, id: gone.membershipId });
    expect(await countRows('memberships', 'id = $1', [gone.membershipId])).toBe(0);
    expect(await countRows('users', 'id = $1', [gone.id])).toBe(1);
    const [event] = await sql<{ action: string; before: { email: string; role: string }; after: unknown }>(
      `SELECT action, before, after FROM audit_events WHERE coop_id = $1 AND entity_id = $2 AND action = 'membership.remove'`,
      [ctx.coop.id, String(gone.membershipId)],
    );
    expect(event).toMatchObject({
      action: 'membership.remove',
      before: { email: gone.email, role: 'admin' },
      after: null,
    });
    await goneAgent.get(members(ctx.coop.slug)).expect(404);
  });
});

describe('changes reach an already-signed-in person on their next request', () => {
  it('a demoted admin gets 403 on the very next request', async () => {
    const coop = await makeCoop();
    const first = await makeUser({ coopId: coop.id, role: 'admin' });
    const second = await makeUser({ coopId: coop.id, role: 'admin' });
    const firstAgent = await signIn(first.email);
    const secondAgent = await signIn(second.email);
    await secondAgent.get(members(coop.slug)).expect(200);
    await firstAgent
      .patch(`${members(coop.slug)}/${second.membershipId}`)
      .send({ role: 'member' })
      .expect(200);
    const res = await secondAgent.get(members(coop.slug)).expect(403);
    expect(res.body.error).toMatch(/role/);
    const mine = await secondAgent.get('/api/coops').expect(200);
    expect(mine.body.coops).toEqual([expect.objectContaining({ slug: coop.slug, role: 'member', status: 'active' })]);
  });

  it('a suspended admin gets 403 on the very next request, and is back after reinstatement', async () => {
    const coop = await makeCoop();
    const first = await makeUser({ coopId: coop.id, role: 'admin' });
    const second = await makeUser({ coopId: coop.id, role: 'admin' });
    const firstAgent = await signIn(first.email);
    const secondAgent = await signIn(second.email);
    await secondAgent.get(members(coop.slug)).expect(200);
    await firstAgent
      .patch(`${members(coop.slug)}/${second.membershipId}`)
      .send({ status: 'suspended' })
      .expect(200);
    const res = await secondAgent.get(members(coop.slug)).expect(403);
    expect(res.body.error).toMatch(/suspended/);
    await firstAgent
      .patch(`${members(coop.slug)}/${second.membershipId}`)
      .send({ status: 'active' })
      .expect(200);
    await secondAgent.get(members(coop.slug)).expect(200);
  });
});

describe('the last active admin', () => {
  it('cannot be demoted, suspended or removed (409 with a clear message, nothing written)', async () => {
    const coop = await makeCoop();
    const admin = await makeUser({ coopId: coop.id, role: 'admin' });
    await makeUser({ coopId: coop.id, role: 'member' });
    // A suspended admin does not count as an active one.
    await makeUser({ coopId: coop.id, role: 'admin', status: 'suspended' });
    const agent = await signIn(admin.email);
    const url = `${members(coop.slug)}/${admin.membershipId}`;
    for (const req of [
      agent.patch(url).send({ role: 'treasurer' }),
      agent.patch(url).send({ status: 'suspended' }),
      agent.delete(url),
    ]) {
      const res = await req.expect(409);
      expect(res.body.error).toMatch(/at least one active admin/);
    }
    expect(await membership(admin.membershipId!)).toEqual({ role: 'admin', status: 'active' });
    expect(await countRows('audit_events', 'coop_id = $1', [coop.id])).toBe(0);
  });

  it('two admins demoting each other at the same moment: exactly one succeeds', async () => {
    const coop = await makeCoop();
    const a = await makeUser({ coopId: coop.id, role: 'admin' });
    const b = await makeUser({ coopId: coop.id, role: 'admin' });
    const [agentA, agentB] = [await signIn(a.email), await signIn(b.email)];
    const results = await Promise.all([
      agentA.patch(`${members(coop.slug)}/${b.membershipId}`).send({ role: 'member' }),
      agentB.patch(`${members(coop.slug)}/${a.membershipId}`).send({ role: 'member' }),
    ]);
    const statuses = results.map((r) => r.status).sort();
    // The loser either hits the last-admin rule (409) or was demoted before its own check (403).
    expect(statuses[0]).toBe(200);
    expect([403, 409]).toContain(statuses[1]);
    expect(await countRows('memberships', "coop_id = $1 AND role = 'admin' AND status = 'active'", [coop.id])).toBe(1);
  });

  it('can hand over: promote another member first, then step down', async () => {
    const coop = await makeCoop();
    const admin = await makeUser({ coopId: coop.id, role: 'admin' });
    const next = await makeUser({ coopId: coop.id, role: 'member' });
    const agent = await signIn(admin.email);
    await agent
      .patch(`${members(coop.slug)}/${next.membershipId}`)
      .send({ role: 'admin' })
      .expect(200);
    await agent
      .patch(`${members(coop.slug)}/${admin.membershipId}`)
      .send({ role: 'member' })
      .expect(200);
    await agent.get(members(coop.slug)).expect(403);
    expect(await membership(next.membershipId!)).toEqual({ role: 'admin', status: 'active' });
  });
});

describe('members routes without a session', () => {
  it('answer 401', async () => {
    const coop = await makeCoop();
    await api().get(members(coop.slug)).expect(401);
  });
});
