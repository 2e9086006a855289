import { beforeAll, describe, expect, it } from 'vitest';
import { makeCoopWithRoles, sql } from '../support/api';

// Hand computation: 100 US gal on hand = 378.541 L (NIST Handbook 44: 3.785411784 L/gal) worth
// $310.00 → average cost 31000 ¢ / 100 gal = 310 ¢/gal. Policy: cost + 40 ¢/gal margin + 10 ¢/gal
// surcharge → 360 ¢/gal for off-road and heating; road adds the 24.4 ¢/gal road tax.
describe('overview API', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let url: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    const [t] = await sql<{ id: number }>(
      `INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, reserved_liters, value_cents) VALUES ($1, 'Overview tank', 1000, 378.541, 37.854, 31000) RETURNING id`,
      [ctx.coop.id],
    );
    await sql(
      `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, occurred_at)
       VALUES ($1, $2, 'release', 378.541, 31000, 378.541, 31000, now() - interval '2 days')`,
      [ctx.coop.id, t!.id],
    );
    await sql(
      `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end) VALUES ($1, $2, $3, 37.854, now(), now() + interval '3 days')`,
      [ctx.coop.id, t!.id, ctx.users.member.membershipId],
    );
    await sql(
      `INSERT INTO price_policies (coop_id, kind, margin_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon) VALUES ($1, 'cost-plus-amount', 40, 10, 24.4)`,
      [ctx.coop.id],
    );
    url = `/api/coops/${ctx.coop.slug}/overview`;
  });

  it('everyone sees on hand / reserved / available and the member price in force', async () => {
    const res = await ctx.agents.brewer.get(url).expect(200);
    expect(res.body.tank).toMatchObject({ onHandLiters: '378.541', reservedLiters: '37.854', availableLiters: '340.687', avgCostCentsPerGallon: 310, tanks: 1 });
    expect(res.body.price).toEqual({ kind: 'cost-plus-amount', centsPerGallon: 360, roadTaxCentsPerGallon: 24.4 });
    expect(res.body.admin).toBeUndefined();
  });

  it('a member sees their own open reservations; others do not see them as theirs', async () => {
    const mine = await ctx.agents.member.get(url).expect(200);
    expect(mine.body.member.openReservations).toHaveLength(1);
    expect(mine.body.member.openReservations[0]).toMatchObject({ tankName: 'Overview tank', quantityLiters: '37.854' });
    const theirs = await ctx.agents.treasurer.get(url).expect(200);
    expect(theirs.body.member.openReservations).toHaveLength(0);
  });

  it('admins also get pending invitations and recent changes', async () => {
    await sql(`INSERT INTO invitations (coop_id, email, role, token_hash, expires_at) VALUES ($1, 'new@example.test', 'member', repeat('a', 64), now() + interval '7 days')`, [ctx.coop.id]);
    await sql(`INSERT INTO audit_events (coop_id, actor_user_id, action, entity_type) VALUES ($1, $2, 'member.invite', 'invitation')`, [ctx.coop.id, ctx.users.admin.id]);
    const res = await ctx.agents.admin.get(url).expect(200);
    expect(res.body.admin).toMatchObject({ pendingInvitations: 1, notSentInvitations: 1 });
    expect(res.body.admin.recentEvents[0]).toMatchObject({ action: 'member.invite' });
  });

  it('chart series come back per month and per day, with the release in them', async () => {
    const res = await ctx.agents.member.get(url).expect(200);
    expect(res.body.volumes).toHaveLength(12);
    expect(res.body.volumes.reduce((a: number, v: { releasedLiters: number }) => a + v.releasedLiters, 0)).toBeCloseTo(378.541, 3);
    expect(res.body.tankLevel).toHaveLength(90);
    expect(res.body.tankLevel.at(-1).onHandLiters).toBeCloseTo(378.541, 3);
    expect(res.body.tankLevel[0].onHandLiters).toBe(0);
  });
});
