import { beforeAll, describe, expect, it } from 'vitest';
import { caughtMail, makeCoopWithRoles, makeUser, sql, waitForMail } from '../support/api';
import { mailSettled } from '../support/worker';

// Methanol at 20 % of the oil volume (the batch's methanolPct): 1 US gal = 3.785411784 L
// (NIST Handbook 44), so 20 gal of oil = 75.708 L → 15.142 L methanol; 60 gal → 45.425 L;
// 800 gal → 3028.329 L → 605.666 L. Catalyst (KOH): 7 g/L base ÷ 90 % purity + 1 g/L titration
// ≈ 8.778 g/L: 20 gal ≈ 665 g, 60 gal ≈ 1,994 g, 800 gal ≈ 26,583 g; the lot holds 5,000 g.
describe('low-stock e-mail to the brewers', () => {
  let ctx: Awaited<ReturnType<typeof makeCoopWithRoles>>;
  let base: string;
  let secondBrewer: { email: string };
  const plan = { titrationTrials: [1], catalyst: 'KOH', baseGramsPerLiter: 7, purityPct: 90, methanolPct: 20 };
  const lowMail = async (to: string) => (await caughtMail(to)).filter((m) => /^.*: low /.test(m.subject));

  beforeAll(async () => {
    ctx = await makeCoopWithRoles();
    secondBrewer = await makeUser({ coopId: ctx.coop.id, role: 'brewer' });
    await makeUser({ coopId: ctx.coop.id, role: 'brewer', status: 'suspended' });
    base = `/api/coops/${ctx.coop.slug}`;
  });

  it('crossing sends one e-mail to each active brewer; more writes while low send none; restock then cross again sends one more', async () => {
    const b = ctx.agents.brewer;
    await b
      .post(`${base}/supplies/chemicals`)
      .send({
        kind: 'methanol',
        supplier: 'Valley Chem Supply',
        receivedOn: '2026-10-01',
        quantity: 50,
        unit: 'L',
        totalCost: '75.00',
      })
      .expect(201);
    await b
      .post(`${base}/supplies/chemicals`)
      .send({
        kind: 'KOH',
        supplier: 'Lakeside Lab Goods',
        receivedOn: '2026-10-01',
        quantity: 5,
        unit: 'kg',
        totalCost: '42.50',
        purityPct: 90,
      })
      .expect(201);

    // A (next) and B, 20 gal each: 50 L covers A's 15.142 L → no e-mail.
    const a = await b
      .post(`${base}/batches`)
      .send({ ...plan, oilVolume: 20, batchDate: '2026-11-01' })
      .expect(201);
    await b
      .post(`${base}/batches`)
      .send({ ...plan, oilVolume: 20, batchDate: '2026-11-20' })
      .expect(201);
    // A starts: it commits 15.142 L; B is next and 34.858 L covers it.
    await b.post(`${base}/batches/${a.body.id}/advance`).send({ to: 'reacting' }).expect(200);
    await mailSettled(); // the alerts are mail jobs: let the worker send whatever was queued
    expect(await lowMail(ctx.users.brewer.email)).toHaveLength(0);

    // C (60 gal, dated before B) becomes the next planned batch: 45.425 L > 34.858 L available → low.
    const c = await b
      .post(`${base}/batches`)
      .send({ ...plan, oilVolume: 60, batchDate: '2026-11-10' })
      .expect(201);
    const first = await waitForMail(ctx.users.brewer.email, (m) => /low methanol/.test(m.subject));
    expect(first.subject).toMatch(new RegExp(`low methanol for batch ${c.body.number}$`));
    expect(first.text).toContain(`/c/${ctx.coop.slug}/supplies`);
    expect(first.text).toMatch(/needs 12\.0 gal/); // 45.425 L = 12.0 gal
    await mailSettled();
    expect(await lowMail(ctx.users.brewer.email)).toHaveLength(1);
    expect(await lowMail(secondBrewer.email)).toHaveLength(1);
    for (const who of ['admin', 'treasurer', 'member'] as const)
      expect(await lowMail(ctx.users[who].email)).toHaveLength(0);
    const [state] = await sql<{ state: string; last_sent_at: Date | null }>(
      `SELECT state, last_sent_at FROM low_stock_alerts WHERE coop_id = $1 AND chemical = 'methanol'`,
      [ctx.coop.id],
    );
    expect(state).toMatchObject({ state: 'low' });
    expect(state!.last_sent_at).not.toBeNull();

    // Still low: editing C and planning another batch send nothing more (in parallel, too).
    await Promise.all([
      b.patch(`${base}/batches/${c.body.id}`).send({ notes: 'Waiting for methanol' }).expect(200),
      b
        .post(`${base}/batches`)
        .send({ ...plan, oilVolume: 20, batchDate: '2026-12-01' })
        .expect(201),
      ctx.agents.admin.patch(`${base}/batches/${c.body.id}`).send({ oilVolume: 61 }).expect(200),
    ]);
    await mailSettled();
    expect(await lowMail(ctx.users.brewer.email)).toHaveLength(1);

    // Restock 100 L: covered again (state back to ok), no e-mail.
    await b
      .post(`${base}/supplies/chemicals`)
      .send({
        kind: 'methanol',
        supplier: 'Valley Chem Supply',
        receivedOn: '2026-11-05',
        quantity: 100,
        unit: 'L',
        totalCost: '150.00',
      })
      .expect(201);
    const [ok] = await sql<{ state: string }>(
      `SELECT state FROM low_stock_alerts WHERE coop_id = $1 AND chemical = 'methanol'`,
      [ctx.coop.id],
    );
    expect(ok!.state).toBe('ok');
    await mailSettled();
    expect(await lowMail(ctx.users.brewer.email)).toHaveLength(1);

    // Crossing again (C grows to 800 gal: 605.666 L methanol, ~26.6 kg KOH) → one more e-mail naming both.
    await b.patch(`${base}/batches/${c.body.id}`).send({ oilVolume: 800 }).expect(200);
    await mailSettled();
    const mails = await lowMail(ctx.users.brewer.email);
    expect(mails).toHaveLength(2);
    expect(mails[0]!.subject).toMatch(/low methanol and KOH/);
    expect(await lowMail(secondBrewer.email)).toHaveLength(2);
  });

  it("another co-op's writes never touch this co-op's alert state", async () => {
    await ctx.agents.outsider
      .post(`/api/coops/${ctx.coop.slug}/supplies/chemicals`)
      .send({ kind: 'methanol', supplier: 'X', receivedOn: '2026-11-05', quantity: 1000, unit: 'L', totalCost: '1.00' })
      .expect(404);
    const [s] = await sql<{ state: string }>(
      `SELECT state FROM low_stock_alerts WHERE coop_id = $1 AND chemical = 'methanol'`,
      [ctx.coop.id],
    );
    expect(s!.state).toBe('low');
  });
});
