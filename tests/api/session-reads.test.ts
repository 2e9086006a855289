// The busiest read routes (batch list, planner, tank list, overview) read the session, the user's
// session version and their membership on every request. These tests change the membership, the
// session and the co-op between requests and check that each answer follows the fresh state from
// the very next request.
import { beforeAll, describe, expect, it } from 'vitest';
import type { Response } from 'supertest';
import { api as http, makeCoopWithRoles, makeUser, type Role, signIn, sql } from '../support/api';
import { insertBatch } from '../support/batches';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;
type Agent = Ctx['agents']['brewer'];
const base = (slug: string) => `/api/coops/${slug}`;
const numbers = (body: { rows: { number: number }[] }) => body.rows.map((r) => r.number).sort();

describe('the session and membership are read fresh on every request', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    const [tank] = await sql<{ id: number }>(
      `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Main', 1000) RETURNING id`,
      [ctx.coop.id],
    );
    const costs = { methanol: 1000, catalyst: 200, energy: 50, feedstock: 0, other: 0 };
    await insertBatch(ctx.coop.id, {
      number: 1,
      released: { at: '2026-11-20T12:00:00Z', tankId: tank!.id, liters: '100.000', costs },
    });
    await insertBatch(ctx.coop.id, { number: 2, status: 'planned' });
  });

  const planner = (agent: Agent | ReturnType<typeof http>, body: string) =>
    agent
      .post(`${base(ctx.coop.slug)}/planner`)
      .set('content-type', 'application/json')
      .send(body);
  const PLAN = '{"oilVolume": 40, "titrationTrials": [2]}';

  /**
   * Each route, asked by a fresh person with role `from`: what it answers them, and what it
   * answers once they are demoted to `to` (checked on the very next request).
   */
  const routes: {
    name: string;
    from: Role;
    to: Role;
    /** A key of the success answer, which a refusal must not carry. */
    payload: string;
    ask: (a: Agent) => PromiseLike<Response>;
    before: (res: Response) => void;
    after: (res: Response) => void;
  }[] = [
    {
      name: 'batch list',
      from: 'brewer',
      to: 'member',
      payload: 'rows',
      ask: (a) => a.get(`${base(ctx.coop.slug)}/batches`),
      before: (res) => expect(numbers(res.body)).toEqual([1, 2]),
      after: (res) => expect(numbers(res.body)).toEqual([1]),
    },
    {
      name: 'planner',
      from: 'brewer',
      to: 'treasurer',
      payload: 'plan',
      ask: (a) => planner(a, PLAN),
      before: (res) => expect(res.status).toBe(200),
      after: (res) => expect(res.status).toBe(403),
    },
    {
      name: 'tank list',
      from: 'admin',
      to: 'member',
      payload: 'tanks',
      ask: (a) => a.get(`${base(ctx.coop.slug)}/tanks`),
      before: (res) => expect(res.body.tanks).toHaveLength(1),
      after: (res) => expect(res.body.tanks).toHaveLength(1),
    },
    {
      name: 'overview',
      from: 'admin',
      to: 'member',
      payload: 'tank',
      ask: (a) => a.get(`${base(ctx.coop.slug)}/overview`),
      before: (res) =>
        expect(res.body).toMatchObject({ role: 'admin', admin: expect.any(Object), treasurer: expect.any(Object) }),
      after: (res) => {
        expect(res.body.role).toBe('member');
        expect(res.body.admin).toBeUndefined();
        expect(res.body.treasurer).toBeUndefined();
      },
    },
  ];

  for (const route of routes) {
    it(`${route.name}: a demotion, suspension, removal and sign-out everywhere count from the very next request`, async () => {
      const u = await makeUser({ coopId: ctx.coop.id, role: route.from });
      const agent = await signIn(u.email);
      const ok = async () => {
        const res = await route.ask(agent);
        expect(res.status, JSON.stringify(res.body)).toBe(200);
        route.before(res);
      };
      const refused = async (status: number) => {
        const res = await route.ask(agent);
        expect(res.status).toBe(status);
        expect(res.body[route.payload]).toBeUndefined();
      };
      await ok();
      await ok();

      await sql(`UPDATE memberships SET role = $2 WHERE id = $1`, [u.membershipId, route.to]);
      route.after(await route.ask(agent));
      await sql(`UPDATE memberships SET role = $2 WHERE id = $1`, [u.membershipId, route.from]);
      await ok();

      await sql(`UPDATE memberships SET status = 'suspended' WHERE id = $1`, [u.membershipId]);
      await refused(403);
      await sql(`UPDATE memberships SET status = 'active' WHERE id = $1`, [u.membershipId]);
      await ok();

      await sql(`DELETE FROM memberships WHERE id = $1`, [u.membershipId]);
      await refused(404);
      await sql(`INSERT INTO memberships (coop_id, user_id, role) VALUES ($1, $2, $3)`, [
        ctx.coop.id,
        u.id,
        route.from,
      ]);
      await ok();

      // Signing out everywhere bumps the session version; this browser keeps its old cookie.
      await agent.post('/api/me/sign-out-everywhere').expect(200);
      await refused(401);
    });
  }

  it('batch list: the query string is judged after the session check', async () => {
    const { agents, coop } = ctx;
    await http()
      .get(`${base(coop.slug)}/batches?pageSize=lots`)
      .expect(401);
    await agents.outsider.get(`${base(coop.slug)}/batches?pageSize=lots`).expect(404);
    await agents.member.get(`${base(coop.slug)}/batches`).expect(200);
    const bad = await agents.member.get(`${base(coop.slug)}/batches?pageSize=lots`).expect(422);
    expect(Object.keys(bad.body.fields)).toEqual(['pageSize']);
  });

  it('batch list: a member sees released batches only, whatever they filter on', async () => {
    const { agents, coop } = ctx;
    await agents.brewer.get(`${base(coop.slug)}/batches?status=planned`).expect(200);
    const res = await agents.member.get(`${base(coop.slug)}/batches?status=planned`).expect(200);
    expect(res.body).toMatchObject({ rows: [], total: 0 });
    expect(numbers((await agents.member.get(`${base(coop.slug)}/batches`).expect(200)).body)).toEqual([1]);
  });

  it('planner: the body is judged after the session check, and the role is checked on every request', async () => {
    const { agents } = ctx;
    expect((await planner(http(), 'not json')).status).toBe(401);
    expect((await planner(agents.member, 'not json')).status).toBe(403);
    expect((await planner(agents.brewer, PLAN)).status).toBe(200);
    expect((await planner(agents.brewer, 'not json')).status).toBe(400);
    const invalid = await planner(agents.brewer, '{"oilVolume": -1, "titrationTrials": [2]}');
    expect(invalid.status).toBe(422);
    expect(Object.keys(invalid.body.fields)).toEqual(['oilVolume']);
  });

  it('tank list: a change of the co-op’s units shows in the very next answer', async () => {
    const { agents, coop } = ctx;
    const first = await agents.treasurer.get(`${base(coop.slug)}/tanks`).expect(200);
    expect(first.body.units).toBe('us');
    expect(first.body.tanks[0].capacity).toBeCloseTo(1000 / 3.785411784, 3); // US gallon = 3.785411784 L (NIST Handbook 44)
    await sql(`UPDATE coops SET units = 'metric' WHERE id = $1`, [coop.id]);
    const metric = await agents.treasurer.get(`${base(coop.slug)}/tanks`).expect(200);
    expect(metric.body.units).toBe('metric');
    expect(metric.body.tanks[0].capacity).toBe(1000);
    await sql(`UPDATE coops SET units = 'us' WHERE id = $1`, [coop.id]);
  });
});
