import { beforeAll, describe, expect, it } from 'vitest';
import { api, makeCoopWithRoles, sql } from '../support/api';
import { insertBatch } from '../support/batches';

// Hand computation: 100 US gal on hand = 378.541 L (NIST Handbook 44: 3.785411784 L/gal) worth
// $310.00 → average cost 31000 ¢ / 100 gal = 310 ¢/gal. Policy: cost + 40 ¢/gal margin + 10 ¢/gal
// surcharge → 360 ¢/gal for off-road and heating; road adds the 24.4 ¢/gal road tax.
describe('overview API', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let url: string;
  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    const [t] = await sql<{ id: number }>(
      `WITH t AS (INSERT INTO tanks (coop_id, name, capacity_liters, on_hand_liters, reserved_liters, value_cents) VALUES ($1, 'Overview tank', 1000, 378.541, 37.854, 31000) RETURNING id, coop_id),
            l AS (INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, 378.541 FROM t)
       SELECT id FROM t`,
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
    expect(res.body.tank).toMatchObject({
      onHandLiters: '378.541',
      reservedLiters: '37.854',
      availableLiters: '340.687',
      avgCostCentsPerGallon: 310,
      tanks: 1,
    });
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
    await sql(
      `INSERT INTO invitations (coop_id, email, role, token_hash, expires_at) VALUES ($1, 'new@example.test', 'member', repeat('a', 64), now() + interval '7 days')`,
      [ctx.coop.id],
    );
    await sql(
      `INSERT INTO audit_events (coop_id, actor_user_id, action, entity_type) VALUES ($1, $2, 'member.invite', 'invitation')`,
      [ctx.coop.id, ctx.users.admin.id],
    );
    const res = await ctx.agents.admin.get(url).expect(200);
    expect(res.body.admin).toMatchObject({ pendingInvitations: 1, notSentInvitations: 1 });
    expect(res.body.admin.recentEvents[0]).toMatchObject({ action: 'member.invite' });
  });

  it('chart series come back per month and per day, with the release in them', async () => {
    const res = await ctx.agents.member.get(url).expect(200);
    expect(res.body.volumes).toHaveLength(12);
    expect(res.body.volumes.reduce((a: number, v: { releasedLiters: number }) => a + v.releasedLiters, 0)).toBeCloseTo(
      378.541,
      3,
    );
    expect(res.body.tankLevel).toHaveLength(90);
    expect(res.body.tankLevel.at(-1).onHandLiters).toBeCloseTo(378.541, 3);
    expect(res.body.tankLevel[0].onHandLiters).toBe(0);
  });

  // Role sections. Hand computation, this month (co-op time zone):
  //   member invoice 12,000 ¢ issued, 4,500 ¢ paid → 7,500 ¢ unpaid; brewer invoice 3,000 ¢ issued, unpaid;
  //   a draft of 999 ¢ (not counted as invoiced); member credit 250 ¢; one cash payment of 2,000 ¢ unmatched.
  //   invoiced 15,000 ¢, paid 4,500 ¢, outstanding 10,500 ¢, 2 issued, 1 draft, 1 unmatched payment (2,000 ¢).
  describe('role sections', () => {
    beforeAll(async () => {
      const month = `date_trunc('month', now() AT TIME ZONE (SELECT timezone FROM coops WHERE id = $1))::date`;
      await sql(
        `INSERT INTO invoices (coop_id, membership_id, period, number, status, total_cents, paid_cents, issued_at) VALUES ($1, $2, ${month}, 1, 'partly-paid', 12000, 4500, now())`,
        [ctx.coop.id, ctx.users.member.membershipId],
      );
      await sql(
        `INSERT INTO invoices (coop_id, membership_id, period, number, status, total_cents, paid_cents, issued_at) VALUES ($1, $2, ${month}, 2, 'issued', 3000, 0, now())`,
        [ctx.coop.id, ctx.users.brewer.membershipId],
      );
      await sql(
        `INSERT INTO invoices (coop_id, membership_id, period, status, total_cents) VALUES ($1, $2, ${month}, 'draft', 999)`,
        [ctx.coop.id, ctx.users.treasurer.membershipId],
      );
      await sql(
        `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind) VALUES ($1, $2, 250, 'overpayment')`,
        [ctx.coop.id, ctx.users.member.membershipId],
      );
      await sql(
        `INSERT INTO payments (coop_id, membership_id, method, amount_cents, unallocated_cents, received_on, period) VALUES ($1, $2, 'cash', 2000, 2000, current_date, date_trunc('month', current_date)::date)`,
        [ctx.coop.id, ctx.users.brewer.membershipId],
      );
      // Batches: #1 released 100 gal (378.541 L) costing 4,000 + 600 + 500 + 1,000 + 0 = 6,100 ¢ → 61 ¢/gal
      // (40 methanol, 6 catalyst, 5 energy, 10 feedstock); #2 reacting; #3 and #4 planned (#3 first by date).
      const [tank] = await sql<{ id: number }>(`SELECT id FROM tanks WHERE coop_id = $1`, [ctx.coop.id]);
      await insertBatch(ctx.coop.id, {
        number: 1,
        released: {
          at: new Date(Date.now() - 86400e3).toISOString(),
          tankId: tank!.id,
          liters: '378.541',
          costs: { methanol: 4000, catalyst: 600, energy: 500, feedstock: 1000, other: 0 },
        },
      });
      await insertBatch(ctx.coop.id, {
        number: 2,
        status: 'reacting',
        oilLiters: 150,
        methanolLiters: 30,
        catalystGrams: 1200,
      });
      await insertBatch(ctx.coop.id, {
        number: 3,
        oilLiters: 200,
        methanolLiters: 40,
        catalystGrams: 1800,
        batchDate: '2026-01-05',
      });
      await insertBatch(ctx.coop.id, {
        number: 4,
        oilLiters: 100,
        methanolLiters: 20,
        catalystGrams: 900,
        batchDate: '2026-02-05',
      });
      // Stock: 60 L methanol − 30 L committed = 30 L < 40 L needed → short; 5,000 g KOH − 1,200 g = 3,800 g ≥ 1,800 g → covered.
      await sql(
        `INSERT INTO chemical_lots (coop_id, kind, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents) VALUES ($1, 'methanol', 'Valley Chem Supply', '2026-01-01', 'L', 60, 60, 9000)`,
        [ctx.coop.id],
      );
      await sql(
        `INSERT INTO chemical_lots (coop_id, kind, supplier, received_on, quantity_unit, quantity, remaining_quantity, total_cost_cents, purity_pct) VALUES ($1, 'KOH', 'Lakeside Lab Goods', '2026-01-01', 'g', 5000, 5000, 4250, 90)`,
        [ctx.coop.id],
      );
    });

    it('every role sees their own unpaid balance and credit', async () => {
      const m = await ctx.agents.member.get(url).expect(200);
      expect(m.body.account).toEqual({ outstandingCents: 7500, creditCents: 250, unallocatedCents: 0 });
      const b = await ctx.agents.brewer.get(url).expect(200);
      expect(b.body.account).toEqual({ outstandingCents: 3000, creditCents: 0, unallocatedCents: 2000 });
    });

    it('members see no brewing, billing, cost or balance sections', async () => {
      const m = await ctx.agents.member.get(url).expect(200);
      for (const k of ['brewer', 'treasurer', 'batchCosts', 'balances', 'admin']) expect(m.body[k]).toBeUndefined();
    });

    it('brewers see batches under way, the next planned batch and whether stock covers it', async () => {
      const res = await ctx.agents.brewer.get(url).expect(200);
      expect(res.body.brewer.inProgress.map((b: { number: number }) => b.number)).toEqual([2]);
      // The one verdict wording of lib/quality (evaluateQuality), as on the batch list, page and PDF: no laboratory results yet.
      const screened = {
        text: expect.stringMatching(/^Screened — 0 of \d+ required properties tested, none failing$/),
        kind: 'screened',
      };
      expect(res.body.brewer.inProgress[0].quality).toEqual(screened);
      expect(res.body.brewer.recentReleased).toEqual([
        expect.objectContaining({ number: 1, releasedLiters: 378.541, quality: screened }),
      ]);
      expect(res.body.brewer.nextPlanned).toMatchObject({
        number: 3,
        batchDate: '2026-01-05',
        oilLiters: 200,
        catalyst: 'KOH',
      });
      expect(res.body.brewer.stock).toEqual([
        { kind: 'methanol', unit: 'L', available: 30, need: 40, low: true },
        { kind: 'KOH', unit: 'g', available: 3800, need: 1800, low: false },
      ]);
      expect(res.body.batchCosts).toEqual([
        expect.objectContaining({
          number: 1,
          releasedLiters: 378.541,
          methanol: 40,
          catalyst: 6,
          energy: 5,
          feedstock: 10,
          other: 0,
          totalCentsPerGallon: 61,
        }),
      ]);
      expect(res.body.treasurer).toBeUndefined();
      expect(res.body.balances).toBeUndefined();
    });

    it("treasurers see the month's invoiced / paid / outstanding, unmatched payments and who owes most", async () => {
      const res = await ctx.agents.treasurer.get(url).expect(200);
      expect(res.body.treasurer).toMatchObject({
        invoicedCents: 15000,
        paidCents: 4500,
        outstandingCents: 10500,
        invoices: 2,
        drafts: 1,
        unmatchedPayments: 1,
        unmatchedCents: 2000,
      });
      expect(res.body.treasurer.period).toMatch(/^\d{4}-\d{2}$/);
      expect(res.body.balances).toMatchObject({ membersOwing: 2, totalOutstandingCents: 10500 });
      expect(res.body.balances.topOwing.map((r: { outstandingCents: number }) => r.outstandingCents)).toEqual([
        7500, 3000,
      ]);
      expect(res.body.batchCosts).toHaveLength(1);
      expect(res.body.brewer).toBeUndefined();
    });

    it('admins see every section', async () => {
      const res = await ctx.agents.admin.get(url).expect(200);
      for (const k of ['brewer', 'treasurer', 'batchCosts', 'balances', 'admin', 'account'])
        expect(res.body[k]).toBeDefined();
    });

    it('the unit switch changes what the page shows, not what is stored', async () => {
      await sql(`UPDATE coops SET units = 'metric' WHERE id = $1`, [ctx.coop.id]);
      try {
        const res = await ctx.agents.brewer.get(url).expect(200);
        expect(res.body.tank.onHandLiters).toBe('378.541');
        const page = await ctx.agents.brewer.get(`/c/${ctx.coop.slug}`).expect(200);
        expect(page.text).toContain('150 L'); // batch 2's oil, 150 L stored
      } finally {
        await sql(`UPDATE coops SET units = 'us' WHERE id = $1`, [ctx.coop.id]);
      }
      const page = await ctx.agents.brewer.get(`/c/${ctx.coop.slug}`).expect(200);
      expect(page.text).toContain('40 gal'); // 150 L ÷ 3.785411784 = 39.6 → 40 gal
      const [t] = await sql<{ on_hand_liters: string }>(`SELECT on_hand_liters FROM tanks WHERE coop_id = $1`, [
        ctx.coop.id,
      ]);
      expect(t!.on_hand_liters).toBe('378.541');
    });

    it("another co-op's members get 404, signed-out people 401", async () => {
      await ctx.agents.outsider.get(url).expect(404);
      await api().get(url).expect(401);
    });
  });
});
