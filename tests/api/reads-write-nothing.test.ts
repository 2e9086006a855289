// Reads never write: a removed member, a suspended member and a signed-out person (who keeps the
// cookie of a session that "sign out everywhere" ended) ask for the busiest reads and pages, and
// the database is exactly as it was: the row count of every table, the latest updated_at of every
// table that has one, and the audit log. Before each case the co-op gets an open reservation whose
// window has ended, the kind a read must not quietly expire.
import { beforeAll, describe, expect, it } from 'vitest';
import { api, makeCoopWithRoles, makeUser, signIn, sql } from '../support/api';
import { insertBatch } from '../support/batches';

type Agent = Awaited<ReturnType<typeof signIn>>;

/** Every table's row count and latest updated_at, and the audit log's size and last entry. */
async function snapshot(): Promise<Record<string, string>> {
  const tables = await sql<{ name: string; updated: boolean }>(
    `SELECT t.table_name AS name,
            EXISTS (SELECT 1 FROM information_schema.columns c
                    WHERE c.table_schema = t.table_schema AND c.table_name = t.table_name AND c.column_name = 'updated_at') AS updated
       FROM information_schema.tables t
      WHERE t.table_schema = 'public' AND t.table_type = 'BASE TABLE'
      ORDER BY 1`,
  );
  const parts = tables.map(
    (t) =>
      `SELECT '${t.name}' AS name, count(*)::text || ' rows' || ${t.updated ? `', updated ' || coalesce(max(updated_at)::text, '-')` : `''`} AS state FROM "${t.name}"`,
  );
  parts.push(
    `SELECT 'audit_events (last)' AS name, coalesce(max(id)::text, '-') || ' ' || coalesce(max(created_at)::text, '-') AS state FROM audit_events`,
  );
  const rows = await sql<{ name: string; state: string }>(parts.join(' UNION ALL '));
  return Object.fromEntries(rows.map((r) => [r.name, r.state]));
}

describe('a removed, suspended or signed-out person’s reads write nothing', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let slug: string;
  let paths: string[];
  let pages: string[];
  let tankId: number;
  const people: Record<'removed' | 'suspended' | 'signedOut', { id: number; membershipId: number; agent: Agent }> =
    {} as never;

  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    slug = ctx.coop.slug;
    const [tank] = await sql<{ id: number }>(
      `WITH t AS (INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, value_cents) VALUES ($1, 'Main', 1000, 500, 100000) RETURNING id, coop_id),
            l AS (INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, 500 FROM t)
       SELECT id FROM t`,
      [ctx.coop.id],
    );
    const costs = { methanol: 1000, catalyst: 200, energy: 50, feedstock: 0, other: 0 };
    const batchId = await insertBatch(ctx.coop.id, {
      number: 1,
      released: { at: '2026-11-20T12:00:00Z', tankId: tank!.id, liters: '100.000', costs },
    });
    const [invoice] = await sql<{ id: number }>(
      `INSERT INTO invoices (coop_id, membership_id, period, number, status, total_cents, issued_at)
       VALUES ($1, $2, date_trunc('month', now())::date, 1, 'issued', 1500, now()) RETURNING id`,
      [ctx.coop.id, ctx.users.member.membershipId],
    );
    tankId = tank!.id;
    const co = `/api/coops/${slug}`;
    paths = [
      `${co}/tanks`,
      `${co}/tanks/${tank!.id}`,
      `${co}/tanks/${tank!.id}/movements`,
      `${co}/reservations`,
      `${co}/draws`,
      `${co}/pricing`,
      `${co}/overview`,
      `${co}/batches`,
      `${co}/batches/${batchId}`,
      `${co}/supplies/stock`,
      `${co}/invoices`,
      `${co}/billing/invoices`,
      `${co}/billing/invoices/${invoice!.id}`,
      `${co}/billing/payments`,
      `${co}/members`,
      `${co}/audit`,
    ];
    pages = [`/c/${slug}`, `/c/${slug}/tank`, `/c/${slug}/batches`, `/c/${slug}/invoices`];

    // Three admins (every read is theirs to make) who have all made these reads before.
    for (const who of ['removed', 'suspended', 'signedOut'] as const) {
      const u = await makeUser({ coopId: ctx.coop.id, role: 'admin' });
      people[who] = { id: u.id, membershipId: u.membershipId!, agent: await signIn(u.email) };
      for (const p of paths) {
        const res = await people[who].agent.get(p);
        expect(res.status, `${p}: ${JSON.stringify(res.body)}`).toBe(200);
      }
    }

    const admin = ctx.agents.admin;
    await admin.delete(`${co}/members/${people.removed.membershipId}`).expect(200);
    await admin.patch(`${co}/members/${people.suspended.membershipId}`).send({ status: 'suspended' }).expect(200);
    await people.signedOut.agent.post('/api/me/sign-out-everywhere').expect(200);
  });

  /** A reservation whose window ended yesterday, not expired yet (as no write has come since). */
  async function lapsedReservation(): Promise<number> {
    const [r] = await sql<{ id: number }>(
      `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end)
       VALUES ($1, $2, $3, 10, now() - interval '3 days', now() - interval '1 day') RETURNING id`,
      [ctx.coop.id, tankId, ctx.users.member.membershipId],
    );
    await sql('UPDATE tanks SET reserved_liters = reserved_liters + 10 WHERE id = $1', [tankId]);
    return r!.id;
  }

  const cases = [
    { who: 'removed', status: 404 },
    { who: 'suspended', status: 403 },
    { who: 'signedOut', status: 401 },
  ] as const;

  for (const { who, status } of cases) {
    it(`${who}: ${status} on every read, and no row changes`, async () => {
      const lapsedId = await lapsedReservation();
      const before = await snapshot();
      const agent = people[who].agent;
      for (const p of paths) {
        const res = await agent.get(p);
        expect(res.status, p).toBe(status);
        expect(Object.keys(res.body), p).toEqual(['error']);
      }
      for (const p of pages) expect((await agent.get(p)).status, p).toBeLessThan(500);
      expect(await snapshot()).toEqual(before);
      const [r] = await sql<{ status: string }>('SELECT status FROM reservations WHERE id = $1', [lapsedId]);
      expect(r!.status).toBe('open');
    });
  }

  it('without any session: 401 on every read, and no row changes', async () => {
    await lapsedReservation();
    const before = await snapshot();
    for (const p of paths) expect((await api().get(p)).status, p).toBe(401);
    for (const p of pages) expect((await api().get(p)).status, p).toBeLessThan(500);
    expect(await snapshot()).toEqual(before);
  });
});
