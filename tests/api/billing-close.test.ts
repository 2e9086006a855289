// Reconciliation and month close: what blocks a close, matching by hand, and a closed month
// refusing every change (409 from the services, and from the database triggers underneath).
import { beforeAll, describe, expect, it } from 'vitest';
import { countRows, signIn, sql } from '../support/api';
import { dayIn, insertDraw, invoicesOf, issueMonth, makeBillingCoop, monthsAgo, runMonth } from '../support/billing';

const M = monthsAgo(2);
const NOW = monthsAgo(0);

describe('reconciliation and month close', () => {
  let c: Awaited<ReturnType<typeof makeBillingCoop>>;
  let slug: string;
  const inv: Record<string, number> = {};
  let bosCash = 0;
  let annDraw = 0;
  const recon = async (period = M) =>
    (await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${period}/reconciliation`).expect(200)).body;
  const close = (period = M, body: object = { confirm: true }) =>
    c.treasurerAgent.post(`/api/coops/${slug}/billing/periods/${period}/close`).send(body);

  beforeAll(async () => {
    c = await makeBillingCoop({ dues: 1000, members: ['Ann Apple', 'Bo Bean'] });
    slug = c.coop.slug;
    // Ann drew 4 gal (15.142 L) at 400 ¢/gal: 1600.
    annDraw = await insertDraw({
      coopId: c.coop.id,
      tankId: c.tankId,
      membershipId: c.members['Ann Apple']!.membershipId,
      liters: '15.142',
      occurredAt: dayIn(M, 14),
      unitPrice: 400,
      fuelCents: 1600,
    });
    await runMonth(c.treasurerAgent, slug, M);
    await issueMonth(c.treasurerAgent, slug, M);
    for (const r of await invoicesOf(c.coop.id, M)) {
      if (r.membership_id === c.members['Ann Apple']!.membershipId) inv.ann = r.id;
      if (r.membership_id === c.members['Bo Bean']!.membershipId) inv.bo = r.id;
    }
  });

  it('reconciles the month: invoiced = paid + outstanding, and every check balances', async () => {
    const r = await recon();
    // Ann 1600 + 1000 dues = 2600; Bo 1000; Zed 1000 → 4600 invoiced, nothing paid yet.
    expect(r.invoices).toMatchObject({
      issuedCount: 3,
      draftCount: 0,
      invoicedCents: 4600,
      paidCents: 0,
      outstandingCents: 4600,
      unpaidCount: 3,
    });
    expect(r.checks.every((k: { ok: boolean }) => k.ok)).toBe(true);
    expect(r.unbilledDraws.count).toBe(0);
    expect(r.blockers).toEqual([]);
  });

  it('will not close while a payment received that month is unmatched; matching by hand clears it', async () => {
    const pay = await c.treasurerAgent.post(`/api/coops/${slug}/billing/payments`).send({
      memberId: c.members['Bo Bean']!.membershipId,
      method: 'cheque',
      amount: '10.00',
      receivedOn: `${M}-20`,
      reference: 'Cheque 77',
    });
    expect(pay.status).toBe(201);
    bosCash = pay.body.id;
    expect((await recon()).payments.unmatched.map((p: { id: number }) => p.id)).toEqual([bosCash]);

    expect((await close(M, {})).status).toBe(422);
    const refused = await close();
    expect(refused.status).toBe(409);
    expect(refused.body.blockers).toEqual([
      expect.stringMatching(/1 payment\(s\) received this month are not matched/),
    ]);
    expect(await countRows('billing_periods', 'coop_id = $1', [c.coop.id])).toBe(0);

    const wrong = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${bosCash}/match`)
      .send({ invoiceId: inv.ann });
    expect(wrong.status).toBe(422);
    expect(wrong.body.fields.invoiceId).toBeDefined();
    const matched = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${bosCash}/match`)
      .send({ invoiceId: inv.bo });
    expect(matched.status).toBe(200);
    expect(matched.body).toMatchObject({ invoiceId: inv.bo, appliedCents: 1000, unallocatedCents: 0 });
    expect(
      (await c.treasurerAgent.post(`/api/coops/${slug}/billing/payments/${bosCash}/match`).send({ invoiceId: inv.bo }))
        .status,
    ).toBe(409);
    const r = await recon();
    expect(r.payments).toMatchObject({ receivedCents: 1000, appliedCents: 1000, unmatched: [] });
    expect(r.invoices).toMatchObject({ paidCents: 1000, outstandingCents: 3600 });
  });

  it('will not close a month that is not over, or one with drafts', async () => {
    const now = await close(NOW);
    expect(now.status).toBe(409);
    expect(now.body.blockers.join(' ')).toMatch(/not over yet/);
    // A member invoiced late: a draft appears for the month and blocks the close until issued.
    const late = await c.treasurerAgent.post(`/api/coops/${slug}/billing/adjustments`).send({
      memberId: c.members['Bo Bean']!.membershipId,
      amount: '2.50',
      description: 'Key replacement',
      period: M,
    });
    expect(late.status, JSON.stringify(late.body)).toBe(201);
    await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/invoices/${inv.bo}/void`)
      .send({ reason: 'Add the key replacement' })
      .expect(200);
    await runMonth(c.treasurerAgent, slug, M, [c.members['Bo Bean']!.membershipId]);
    const drafts = await close();
    expect(drafts.status).toBe(409);
    expect(drafts.body.blockers.join(' ')).toMatch(/1 draft invoice/);
    await issueMonth(c.treasurerAgent, slug, M);
  });

  it('closes the month, which then refuses every change with a clear 409', async () => {
    const r = await recon();
    expect(r.blockers).toEqual([]);
    const closed = await close();
    expect(closed.status, JSON.stringify(closed.body)).toBe(200);
    expect(closed.body).toMatchObject({ closed: true, closedBy: 'Zed Treasurer' });
    expect((await close()).status).toBe(409);

    const expectClosed = (res: { status: number; body: { error: string; code?: string } }) => {
      expect(res.status).toBe(409);
      expect(res.body.error).toMatch(/is closed/);
    };
    const ann = c.members['Ann Apple']!.membershipId;
    const paymentsBefore = await countRows('payments', 'coop_id = $1', [c.coop.id]);
    expectClosed(
      await c.treasurerAgent
        .post(`/api/coops/${slug}/billing/payments`)
        .send({ memberId: ann, method: 'cash', amount: '5', receivedOn: `${M}-25` }),
    );
    expectClosed(
      await c.treasurerAgent.post(`/api/coops/${slug}/billing/invoices/${inv.ann}/void`).send({ reason: 'Too late' }),
    );
    expectClosed(await c.treasurerAgent.post(`/api/coops/${slug}/billing/runs`).send({ period: M }));
    expectClosed(await c.treasurerAgent.post(`/api/coops/${slug}/billing/periods/${M}/issue`).send({}));
    expectClosed(
      await c.treasurerAgent
        .post(`/api/coops/${slug}/billing/adjustments`)
        .send({ memberId: ann, amount: '-1', description: 'Into a closed month', period: M }),
    );
    expect(await countRows('payments', 'coop_id = $1', [c.coop.id])).toBe(paymentsBefore);
    expect(await countRows('billing_adjustments', 'coop_id = $1', [c.coop.id])).toBe(1);

    // Underneath, the database refuses the same changes whoever tries them.
    await expect(
      insertDraw({
        coopId: c.coop.id,
        tankId: c.tankId,
        membershipId: ann,
        liters: '3.785',
        occurredAt: dayIn(M, 20),
        unitPrice: 400,
        fuelCents: 400,
      }),
    ).rejects.toThrow(/is closed/);
    await expect(sql(`UPDATE draws SET vehicle = 'Tractor' WHERE id = $1`, [annDraw])).rejects.toThrow(/is closed/);
    // occurred_at is also one of a recorded draw's locked columns, so the draws trigger may refuse first.
    await expect(sql(`UPDATE draws SET occurred_at = $2 WHERE id = $1`, [annDraw, dayIn(NOW, 1)])).rejects.toThrow(
      /is closed|cannot be edited/,
    );
    await expect(
      sql(`UPDATE invoices SET status = 'void', voided_at = now() WHERE id = $1`, [inv.ann]),
    ).rejects.toThrow(/is closed/);
    await expect(
      sql(
        `UPDATE payments SET amount_cents = amount_cents + 1, unallocated_cents = unallocated_cents + 1 WHERE id = $1`,
        [bosCash],
      ),
    ).rejects.toThrow(/is closed/);
    await expect(
      sql(`UPDATE billing_periods SET status = 'open', closed_at = NULL WHERE coop_id = $1`, [c.coop.id]),
    ).rejects.toThrow(/cannot be reopened/);
    await expect(sql(`DELETE FROM member_credits WHERE coop_id = $1`, [c.coop.id])).rejects.toThrow(/append-only/);
  });

  it('after close, an open invoice of the month is still payable and corrections go into the next month as adjustments', async () => {
    const annAgent = await signIn(c.members['Ann Apple']!.email);
    const paid = await annAgent.post(`/api/coops/${slug}/invoices/${inv.ann}/pay`).send({ card: 'test-approved' });
    expect(paid.status, JSON.stringify(paid.body)).toBe(200);
    expect(paid.body.invoice).toMatchObject({ status: 'paid', paidCents: 2600, periodClosed: true });

    // Ann was overcharged $5.00 on the closed month: a credit adjustment lands on her next invoice.
    const adj = await c.treasurerAgent.post(`/api/coops/${slug}/billing/adjustments`).send({
      memberId: c.members['Ann Apple']!.membershipId,
      amount: '-5.00',
      description: `Overcharge on ${M} fuel`,
    });
    expect(adj.status).toBe(201);
    expect(adj.body).toMatchObject({ period: NOW, amountCents: -500 });
    await runMonth(c.treasurerAgent, slug, NOW, [c.members['Ann Apple']!.membershipId]);
    const [draft] = (await invoicesOf(c.coop.id, NOW)).filter(
      (r) => r.membership_id === c.members['Ann Apple']!.membershipId,
    );
    // dues 1000 − 500 adjustment = 500
    expect(Number(draft!.total_cents)).toBe(500);
    const lines = await sql<{ kind: string; amount_cents: string }>(
      `SELECT kind, amount_cents FROM invoice_lines WHERE invoice_id = $1 ORDER BY sort_key`,
      [draft!.id],
    );
    expect(lines.map((l) => [l.kind, Number(l.amount_cents)])).toEqual([
      ['dues', 1000],
      ['adjustment', -500],
    ]);
    const pending = await c.treasurerAgent.get(`/api/coops/${slug}/billing/adjustments`).expect(200);
    expect(pending.body.adjustments.map((a: { description: string }) => a.description)).toContain(
      `Overcharge on ${M} fuel`,
    );
  });
});
