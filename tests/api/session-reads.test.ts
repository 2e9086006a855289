// The busiest read routes (batch list, planner, tank list) send the session check and their reads
// in one round trip, with reads built from the actor the server saw last for that user and co-op.
// These tests change the membership, the session and the co-op between requests and check that
// each answer follows the fresh state from the very next request, never the remembered one.
import { beforeAll, describe, expect, it } from 'vitest';
import { api as http, makeCoopWithRoles, sql } from '../support/api';
import { insertBatch } from '../support/batches';

type Ctx = Awaited<ReturnType<typeof makeCoopWithRoles>>;
const base = (slug: string) => `/api/coops/${slug}`;

describe('session check sent with the reads', () => {
  let ctx: Ctx;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    const [tank] = await sql<{ id: number }>(`INSERT INTO tanks (coop_id, name, capacity_liters) VALUES ($1, 'Main', 1000) RETURNING id`, [ctx.coop.id]);
    const costs = { methanol: 1000, catalyst: 200, energy: 50, feedstock: 0, other: 0 };
    await insertBatch(ctx.coop.id, { number: 1, released: { at: '2026-11-20T12:00:00Z', tankId: tank!.id, liters: '100.000', costs } });
    await insertBatch(ctx.coop.id, { number: 2, status: 'planned' });
  });

  const numbers = (body: { rows: { number: number }[] }) => body.rows.map((r) => r.number).sort();

  it('batch list: a demotion, suspension and removal count from the very next request', async () => {
    const { agents, users, coop } = ctx;
    const membership = users.brewer.membershipId;
    // Twice, so the second request already goes out with reads built from the remembered brewer.
    for (let i = 0; i < 2; i++) expect(numbers((await agents.brewer.get(`${base(coop.slug)}/batches`).expect(200)).body)).toEqual([1, 2]);
    await sql(`UPDATE memberships SET role = 'member' WHERE id = $1`, [membership]);
    expect(numbers((await agents.brewer.get(`${base(coop.slug)}/batches`).expect(200)).body)).toEqual([1]);
    await sql(`UPDATE memberships SET role = 'brewer' WHERE id = $1`, [membership]);
    expect(numbers((await agents.brewer.get(`${base(coop.slug)}/batches`).expect(200)).body)).toEqual([1, 2]);
    await sql(`UPDATE memberships SET status = 'suspended' WHERE id = $1`, [membership]);
    const suspended = await agents.brewer.get(`${base(coop.slug)}/batches`).expect(403);
    expect(suspended.body.rows).toBeUndefined();
    await sql(`UPDATE memberships SET status = 'active' WHERE id = $1`, [membership]);
    expect(numbers((await agents.brewer.get(`${base(coop.slug)}/batches`).expect(200)).body)).toEqual([1, 2]);
  });

  it('batch list: signing out everywhere (a new session version) answers 401 at once', async () => {
    const { agents, users, coop } = ctx;
    await agents.admin.get(`${base(coop.slug)}/batches`).expect(200);
    await agents.admin.get(`${base(coop.slug)}/batches`).expect(200);
    await sql(`UPDATE users SET session_version = session_version + 1 WHERE id = $1`, [users.admin.id]);
    const res = await agents.admin.get(`${base(coop.slug)}/batches`).expect(401);
    expect(res.body.rows).toBeUndefined();
  });

  it('batch list: the query string is judged after the session check', async () => {
    const { agents, coop } = ctx;
    await http().get(`${base(coop.slug)}/batches?pageSize=lots`).expect(401);
    await agents.outsider.get(`${base(coop.slug)}/batches?pageSize=lots`).expect(404);
    await agents.member.get(`${base(coop.slug)}/batches`).expect(200);
    const bad = await agents.member.get(`${base(coop.slug)}/batches?pageSize=lots`).expect(422);
    expect(Object.keys(bad.body.fields)).toEqual(['pageSize']);
  });

  it('batch list: a member who was a brewer in another request still sees released batches only', async () => {
    const { agents, coop } = ctx;
    const res = await agents.member.get(`${base(coop.slug)}/batches?status=planned`).expect(200);
    expect(res.body).toMatchObject({ rows: [], total: 0 });
    expect(numbers((await agents.member.get(`${base(coop.slug)}/batches`).expect(200)).body)).toEqual([1]);
  });

  it('planner: the body is judged after the session check, and the role is checked on every request', async () => {
    const { agents, users, coop } = ctx;
    const send = (agent: ReturnType<typeof http> | Ctx['agents']['brewer'], body: string) =>
      agent.post(`${base(coop.slug)}/planner`).set('content-type', 'application/json').send(body);
    expect((await send(http(), 'not json')).status).toBe(401);
    expect((await send(agents.member, 'not json')).status).toBe(403);
    expect((await send(agents.brewer, '{"oilVolume": 40, "titrationTrials": [2]}')).status).toBe(200);
    const notJson = await send(agents.brewer, 'not json');
    expect(notJson.status).toBe(400);
    const invalid = await send(agents.brewer, '{"oilVolume": -1, "titrationTrials": [2]}');
    expect(invalid.status).toBe(422);
    expect(Object.keys(invalid.body.fields)).toEqual(['oilVolume']);
    await sql(`UPDATE memberships SET role = 'treasurer' WHERE id = $1`, [users.brewer.membershipId]);
    expect((await send(agents.brewer, '{"oilVolume": 40, "titrationTrials": [2]}')).status).toBe(403);
    await sql(`UPDATE memberships SET role = 'brewer' WHERE id = $1`, [users.brewer.membershipId]);
    expect((await send(agents.brewer, '{"oilVolume": 40, "titrationTrials": [2]}')).status).toBe(200);
  });

  it('tank list: a change of the co-op’s units shows in the very next answer; removal answers 404', async () => {
    const { agents, users, coop } = ctx;
    const first = await agents.treasurer.get(`${base(coop.slug)}/tanks`).expect(200);
    expect(first.body.units).toBe('us');
    expect(first.body.tanks[0].capacity).toBeCloseTo(1000 / 3.785411784, 3); // US gallon = 3.785411784 L (NIST Handbook 44)
    await agents.treasurer.get(`${base(coop.slug)}/tanks`).expect(200);
    await sql(`UPDATE coops SET units = 'metric' WHERE id = $1`, [coop.id]);
    const metric = await agents.treasurer.get(`${base(coop.slug)}/tanks`).expect(200);
    expect(metric.body.units).toBe('metric');
    expect(metric.body.tanks[0].capacity).toBe(1000);
    await sql(`UPDATE coops SET units = 'us' WHERE id = $1`, [coop.id]);
    await sql(`DELETE FROM memberships WHERE id = $1`, [users.treasurer.membershipId]);
    const gone = await agents.treasurer.get(`${base(coop.slug)}/tanks`).expect(404);
    expect(gone.body.tanks).toBeUndefined();
  });
});
