// Card payments through the SDK against the payments fake, webhooks (replayed, out of order,
// badly signed), the fake being down, cash and cheque, overpayments as credit, refunds, the
// treasurer's payment list and the pending adjustments.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, countRows, signIn, sql } from '../support/api';
import {
  clearHeld,
  fakeCharges,
  heldEvents,
  holdWebhooks,
  invoicesOf,
  issueMonth,
  makeBillingCoop,
  monthsAgo,
  runMonth,
  setOutage,
  signPayload,
} from '../support/billing';

const P = monthsAgo(1);
const NOW = monthsAgo(0);
const NAMES = ['Pat Payer', 'Quinn Quick', 'Rae Ready', 'Sol Slow', 'Tam Twice', 'Uma Upset', 'Vic Vault', 'Wyn Wrong'];

type Agent = Awaited<ReturnType<typeof signIn>>;

describe('paying invoices', () => {
  let c: Awaited<ReturnType<typeof makeBillingCoop>>;
  let slug: string;
  const inv: Record<string, number> = {};
  const agents: Record<string, Agent> = {};
  const chargesFor = async (invoiceId: number) =>
    (await fakeCharges()).filter((ch) => ch.metadata?.invoice_id === String(invoiceId));
  const pay = (name: string, card = 'test-approved', invoiceId = inv[name]!) =>
    agents[name]!.post(`/api/coops/${slug}/invoices/${invoiceId}/pay`).send({ card });
  const invoice = async (id: number) =>
    (
      await sql<{ status: string; paid_cents: string; total_cents: string }>(
        `SELECT status, paid_cents, total_cents FROM invoices WHERE id = $1`,
        [id],
      )
    )[0]!;
  const paymentsOf = (id: number) => countRows('payments', 'invoice_id = $1', [id]);

  beforeAll(async () => {
    // Every member owes this month's dues: $20.00.
    c = await makeBillingCoop({ dues: 2000, members: NAMES });
    slug = c.coop.slug;
    await runMonth(c.treasurerAgent, slug, P);
    await issueMonth(c.treasurerAgent, slug, P);
    for (const r of await invoicesOf(c.coop.id, P)) {
      const name = NAMES.find((n) => c.members[n]!.membershipId === r.membership_id);
      if (name) inv[name] = r.id;
    }
    for (const n of NAMES) agents[n] = await signIn(c.members[n]!.email);
  });

  afterAll(async () => {
    await setOutage(false);
    await clearHeld();
    await holdWebhooks(false);
  });

  it('a card payment succeeds once, with an idempotency key from our own row stored before the call', async () => {
    const res = await pay('Pat Payer');
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.status).toBe('succeeded');
    expect(res.body.invoice).toMatchObject({ status: 'paid', paidCents: 2000, outstandingCents: 0 });
    const [attempt] = await sql<{ id: number; idempotency_key: string; status: string; stripe_charge_id: string }>(
      `SELECT id, idempotency_key, status, stripe_charge_id FROM payment_attempts WHERE invoice_id = $1`,
      [inv['Pat Payer']],
    );
    expect(attempt!.idempotency_key).toMatch(new RegExp(`^payment-attempt-${attempt!.id}-[0-9a-f]{12}$`));
    const charges = await chargesFor(inv['Pat Payer']!);
    expect(charges).toHaveLength(1);
    expect(charges[0]).toMatchObject({
      id: attempt!.stripe_charge_id,
      amount: 2000,
      idempotencyKey: attempt!.idempotency_key,
    });
    expect(await paymentsOf(inv['Pat Payer']!)).toBe(1);
    // The fake's own charge.succeeded webhook arrives too and changes nothing.
    for (
      let i = 0;
      i < 50 && (await countRows('payment_webhook_events', 'object_id = $1', [attempt!.stripe_charge_id])) === 0;
      i++
    )
      await new Promise((r) => setTimeout(r, 100));
    const [ev] = await sql<{ outcome: string }>(`SELECT outcome FROM payment_webhook_events WHERE object_id = $1`, [
      attempt!.stripe_charge_id,
    ]);
    expect(ev!.outcome).toBe('no-change');
    expect(await paymentsOf(inv['Pat Payer']!)).toBe(1);
    const again = await pay('Pat Payer');
    expect(again.status).toBe(409);
    expect(again.body.error).toMatch(/already paid/);
    const mine = await agents['Pat Payer']!.get(`/api/coops/${slug}/invoices`).expect(200);
    expect(mine.body.balance).toEqual({ outstandingCents: 0, creditCents: 0, unallocatedCents: 0 });
  });

  it('a declined card leaves the invoice unpaid; another card then pays it', async () => {
    const res = await pay('Quinn Quick', 'test-declined');
    expect(res.status).toBe(402);
    expect(res.body).toMatchObject({ code: 'card-declined' });
    expect(res.body.error).toMatch(/not accepted.*Nothing was charged/);
    expect(await invoice(inv['Quinn Quick']!)).toMatchObject({ status: 'issued', paid_cents: '0' });
    expect(await paymentsOf(inv['Quinn Quick']!)).toBe(0);
    const detail = await agents['Quinn Quick']!.get(`/api/coops/${slug}/invoices/${inv['Quinn Quick']}`).expect(200);
    expect(detail.body.lastFailedAttempt.message).toMatch(/declined/);
    const ok = await pay('Quinn Quick', 'test-approved');
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(await invoice(inv['Quinn Quick']!)).toMatchObject({ status: 'paid', paid_cents: '2000' });
    expect((await chargesFor(inv['Quinn Quick']!)).length).toBe(1); // the declined try created no successful charge
    expect(await countRows('payment_attempts', 'invoice_id = $1', [inv['Quinn Quick']])).toBe(2);
  });

  it('five simultaneous submissions charge the card once', async () => {
    const results = await Promise.all(Array.from({ length: 5 }, () => pay('Rae Ready')));
    const statuses = results.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s !== 200).every((s) => s === 409)).toBe(true);
    expect(await chargesFor(inv['Rae Ready']!)).toHaveLength(1);
    expect(await paymentsOf(inv['Rae Ready']!)).toBe(1);
    expect(await invoice(inv['Rae Ready']!)).toMatchObject({ status: 'paid', paid_cents: '2000' });
  });

  it('with the payments fake down: a clear error, the invoice stays unpaid, and a later retry charges once', async () => {
    await setOutage(true, '503');
    const res = await pay('Uma Upset');
    expect(res.status).toBe(503);
    expect(res.body.code).toBe('provider-unavailable');
    expect(res.body.error).toMatch(/could not reach the card payment service.*unpaid.*not be charged twice/);
    expect(await invoice(inv['Uma Upset']!)).toMatchObject({ status: 'issued', paid_cents: '0' });
    expect(await paymentsOf(inv['Uma Upset']!)).toBe(0);
    expect(await chargesFor(inv['Uma Upset']!)).toHaveLength(0);
    const [open] = await sql<{ status: string; lease_until: Date | null }>(
      `SELECT status, lease_until FROM payment_attempts WHERE invoice_id = $1`,
      [inv['Uma Upset']],
    );
    expect(open).toMatchObject({ status: 'pending', lease_until: null });

    await setOutage(false);
    const retry = await pay('Uma Upset');
    expect(retry.status, JSON.stringify(retry.body)).toBe(200);
    expect(await chargesFor(inv['Uma Upset']!)).toHaveLength(1);
    expect(await countRows('payment_attempts', 'invoice_id = $1', [inv['Uma Upset']])).toBe(1); // the same attempt and key, replayed
    expect(await invoice(inv['Uma Upset']!)).toMatchObject({ status: 'paid', paid_cents: '2000' });
  });

  it('an answer lost on the way back: the webhook records the payment — replayed 10 times and out of order, it counts once', async () => {
    await holdWebhooks(true);
    await clearHeld();
    await setOutage(true, 'lose-response');
    const res = await pay('Tam Twice');
    await setOutage(false);
    expect(res.status).toBe(503);
    expect(await invoice(inv['Tam Twice']!)).toMatchObject({ status: 'issued', paid_cents: '0' });
    expect(await chargesFor(inv['Tam Twice']!)).toHaveLength(1); // the card WAS charged
    const events = (await heldEvents()).filter(
      (e) => e.type === 'charge.succeeded' && e.payload.includes(`"invoice_id": "${inv['Tam Twice']}"`),
    );
    expect(events).toHaveLength(1);
    const succeeded = events[0]!;

    // A failure notice for the same attempt arriving first (validly signed) …
    const failed = JSON.parse(succeeded.payload);
    failed.id = `${failed.id}_failed`;
    failed.type = 'charge.failed';
    failed.data.object.status = 'failed';
    failed.data.object.paid = false;
    const failedPayload = JSON.stringify(failed);
    const send = (payload: string, signature: string) =>
      api()
        .post('/api/payments/webhook')
        .set('content-type', 'application/json')
        .set('stripe-signature', signature)
        .send(payload);
    expect((await send(failedPayload, signPayload(failedPayload))).status).toBe(200);
    // … then the success, ten times at once, then the failure again.
    const tries = await Promise.all(Array.from({ length: 10 }, () => send(succeeded.payload, succeeded.signature)));
    expect(tries.map((t) => t.status)).toEqual(Array(10).fill(200));
    expect(tries.filter((t) => t.body.duplicate === false)).toHaveLength(1);
    expect((await send(failedPayload, signPayload(failedPayload))).body).toMatchObject({ duplicate: true });

    expect(await paymentsOf(inv['Tam Twice']!)).toBe(1);
    expect(await invoice(inv['Tam Twice']!)).toMatchObject({ status: 'paid', paid_cents: '2000' });
    const [attempt] = await sql<{ status: string }>(`SELECT status FROM payment_attempts WHERE invoice_id = $1`, [
      inv['Tam Twice'],
    ]);
    expect(attempt!.status).toBe('succeeded');
    expect(await countRows('payment_webhook_events', 'stripe_event_id IN ($1, $2)', [succeeded.id, failed.id])).toBe(2);
    // The member trying again now is told it is paid; still one charge.
    expect((await pay('Tam Twice')).status).toBe(409);
    expect(await chargesFor(inv['Tam Twice']!)).toHaveLength(1);
    await clearHeld();
    await holdWebhooks(false);
  });

  it('a webhook with a bad signature is refused with 400 and changes nothing', async () => {
    const payload = JSON.stringify({
      id: 'evt_forged_1',
      object: 'event',
      type: 'charge.succeeded',
      data: {
        object: {
          id: 'ch_forged',
          object: 'charge',
          amount: 2000,
          currency: 'usd',
          status: 'succeeded',
          paid: true,
          metadata: { coop_id: String(c.coop.id), invoice_id: String(inv['Wyn Wrong']), payment_attempt_id: '1' },
          refunds: { data: [] },
        },
      },
    });
    const before = await countRows('payment_webhook_events');
    const payments = await countRows('payments');
    const post = (sig: string | null, body = payload) => {
      const r = api().post('/api/payments/webhook').set('content-type', 'application/json');
      return (sig ? r.set('stripe-signature', sig) : r).send(body);
    };
    expect((await post(signPayload(payload, 'whsec_not_ours'))).status).toBe(400);
    expect((await post(null)).status).toBe(400);
    expect((await post(signPayload(payload), payload.replace('2000', '1'))).status).toBe(400); // body changed after signing
    expect((await post(signPayload(payload, undefined, Math.floor(Date.now() / 1000) - 3600))).status).toBe(400); // an old replay
    const bad = await post('t=1,v1=deadbeef');
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatch(/signature/);
    expect(await countRows('payment_webhook_events')).toBe(before);
    expect(await countRows('payments')).toBe(payments);
    expect(await invoice(inv['Wyn Wrong']!)).toMatchObject({ status: 'issued' });
  });

  it('refuses bad card input, other members’ invoices and drafts', async () => {
    const bad = await pay('Wyn Wrong', '4242424242424242');
    expect(bad.status).toBe(422);
    expect(bad.body.fields.card).toBeDefined();
    const smuggled = await agents['Wyn Wrong']!.post(`/api/coops/${slug}/invoices/${inv['Wyn Wrong']}/pay`).send({
      card: 'test-approved',
      amount: 1,
    });
    expect(smuggled.status).toBe(422);
    expect((await pay('Wyn Wrong', 'test-approved', inv['Vic Vault'])).status).toBe(404);
    expect(await countRows('payment_attempts', 'invoice_id IN ($1, $2)', [inv['Wyn Wrong'], inv['Vic Vault']])).toBe(0);
  });

  it('cash and cheque: partial payments, an overpayment held as credit and applied to the next invoice', async () => {
    const m = c.members['Vic Vault']!.membershipId;
    const record = (body: object) => c.treasurerAgent.post(`/api/coops/${slug}/billing/payments`).send(body);
    const before = await countRows('payments', 'coop_id = $1', [c.coop.id]);
    const bad: [object, string][] = [
      [{ memberId: m, method: 'cash', amount: '-5', receivedOn: `${P}-10` }, 'amount'],
      [{ memberId: m, method: 'cash', amount: '12.345', receivedOn: `${P}-10` }, 'amount'],
      [{ memberId: m, method: 'card', amount: '5', receivedOn: `${P}-10` }, 'method'],
      [{ memberId: m, method: 'cash', amount: '5', receivedOn: '2999-01-01' }, 'receivedOn'],
      [{ memberId: m, method: 'cash', amount: '5', receivedOn: `${P}-31x` }, 'receivedOn'],
      [{ memberId: 999999999, method: 'cash', amount: '5', receivedOn: `${P}-10` }, 'memberId'],
      [{ memberId: m, invoiceId: inv['Wyn Wrong'], method: 'cash', amount: '5', receivedOn: `${P}-10` }, 'invoiceId'],
      [{ memberId: m, method: 'cash', amount: '5', receivedOn: `${P}-10`, coopId: 1 }, 'coopId'],
    ];
    for (const [body, field] of bad) {
      const res = await record(body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(Object.keys(res.body.fields), JSON.stringify(res.body)).toContain(field);
    }
    expect(await countRows('payments', 'coop_id = $1', [c.coop.id])).toBe(before);

    // A $12.00 cheque: partly paid, $8.00 outstanding.
    const cheque = await record({
      memberId: m,
      invoiceId: inv['Vic Vault'],
      method: 'cheque',
      amount: '12.00',
      receivedOn: `${P}-12`,
      reference: 'Cheque 1042',
    });
    expect(cheque.status, JSON.stringify(cheque.body)).toBe(201);
    expect(cheque.body).toMatchObject({ appliedCents: 1200, creditedCents: 0, unallocatedCents: 0 });
    expect(await invoice(inv['Vic Vault']!)).toMatchObject({ status: 'partly-paid', paid_cents: '1200' });
    // $10.00 cash: $8.00 settles the invoice, $2.00 is held as credit.
    const cash = await record({
      memberId: m,
      invoiceId: inv['Vic Vault'],
      method: 'cash',
      amount: '10',
      receivedOn: `${P}-20`,
    });
    expect(cash.body).toMatchObject({ appliedCents: 800, creditedCents: 200 });
    expect(await invoice(inv['Vic Vault']!)).toMatchObject({ status: 'paid', paid_cents: '2000' });
    const vic = await signIn(c.members['Vic Vault']!.email);
    expect((await vic.get(`/api/coops/${slug}/invoices`).expect(200)).body.balance).toEqual({
      outstandingCents: 0,
      creditCents: 200,
      unallocatedCents: 0,
    });
    // Next month: dues 2000 − credit 200 = 1800.
    await runMonth(c.treasurerAgent, slug, NOW, [m]);
    const next = (await invoicesOf(c.coop.id, NOW)).find((r) => r.membership_id === m)!;
    expect(Number(next.total_cents)).toBe(1800);
    await issueMonth(c.treasurerAgent, slug, NOW);
    expect((await vic.get(`/api/coops/${slug}/invoices`).expect(200)).body.balance).toEqual({
      outstandingCents: 1800,
      creditCents: 0,
      unallocatedCents: 0,
    });
  });

  it('refunds: cash from an unmatched payment; card through the SDK once a voided invoice left credit', async () => {
    const pat = c.members['Pat Payer']!.membershipId;
    const unmatched = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments`)
      .send({ memberId: pat, method: 'cash', amount: '30.00', receivedOn: `${NOW}-01` });
    expect(unmatched.status).toBe(201);
    expect(unmatched.body).toMatchObject({ unallocatedCents: 3000, refundableCents: 3000 });
    const tooMuch = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${unmatched.body.id}/refunds`)
      .send({ amount: '30.01', reason: 'Too much' });
    expect(tooMuch.status).toBe(422);
    expect(tooMuch.body.fields.amount).toBeDefined();
    const cashRefund = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${unmatched.body.id}/refunds`)
      .send({ amount: '10.00', reason: 'Paid twice by mistake' });
    expect(cashRefund.status, JSON.stringify(cashRefund.body)).toBe(201);
    expect(cashRefund.body).toMatchObject({
      unallocatedCents: 2000,
      refundedCents: 1000,
      refunds: [expect.objectContaining({ amountCents: 1000, status: 'succeeded' })],
    });

    // Sol pays by card; the invoice is then voided, so the $20.00 becomes credit; $5.00 of it is refunded to the card.
    expect((await pay('Sol Slow')).status).toBe(200);
    await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/invoices/${inv['Sol Slow']}/void`)
      .send({ reason: 'Sol was on leave this month' })
      .expect(200);
    const [p] = await sql<{ id: number; credited_cents: string }>(
      `SELECT id, credited_cents FROM payments WHERE invoice_id = $1`,
      [inv['Sol Slow']],
    );
    expect(Number(p!.credited_cents)).toBe(2000);
    const refund = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${p!.id}/refunds`)
      .send({ amount: '5.00', reason: 'Return part of the credit' });
    expect(refund.status, JSON.stringify(refund.body)).toBe(201);
    expect(refund.body.refunds).toEqual([expect.objectContaining({ amountCents: 500, status: 'succeeded' })]);
    const [r] = await sql<{ idempotency_key: string; stripe_refund_id: string }>(
      `SELECT idempotency_key, stripe_refund_id FROM refunds WHERE payment_id = $1`,
      [p!.id],
    );
    expect(r!.idempotency_key).toMatch(/^refund-\d+-[0-9a-f]{12}$/);
    expect(r!.stripe_refund_id).toMatch(/^re_/);
    const [credit] = await sql<{ s: string }>(
      `SELECT SUM(amount_cents) AS s FROM member_credits WHERE membership_id = $1`,
      [c.members['Sol Slow']!.membershipId],
    );
    expect(Number(credit!.s)).toBe(1500); // +2000 from the void, −500 refunded
    // The fake's charge.refunded webhook races the API answer: whichever is handled first confirms the
    // refund ('applied' when the webhook wins), and the other changes nothing — one refund, credit unchanged.
    for (
      let i = 0;
      i < 50 &&
      (await countRows('payment_webhook_events', `type = 'charge.refunded' AND coop_id = $1`, [c.coop.id])) === 0;
      i++
    )
      await new Promise((res) => setTimeout(res, 100));
    const events = await sql<{ outcome: string }>(
      `SELECT outcome FROM payment_webhook_events WHERE type = 'charge.refunded' AND coop_id = $1`,
      [c.coop.id],
    );
    expect(events).toHaveLength(1);
    expect(['no-change', 'applied']).toContain(events[0]!.outcome);
    expect(await countRows('refunds', `payment_id = $1 AND status = 'succeeded'`, [p!.id])).toBe(1);
    const [after] = await sql<{ s: string }>(
      `SELECT SUM(amount_cents) AS s FROM member_credits WHERE membership_id = $1`,
      [c.members['Sol Slow']!.membershipId],
    );
    expect(Number(after!.s)).toBe(1500);
  });
  it('the treasurer’s payment list: newest first, paged, by month and unmatched only; reading it writes nothing', async () => {
    type Row = {
      id: number;
      memberName: string;
      receivedOn: string;
      period: string;
      unallocatedCents: number;
      refunds: { amountCents: number }[];
    };
    const list = async (q: string) =>
      (await c.treasurerAgent.get(`/api/coops/${slug}/billing/payments?${q}`).expect(200)).body as {
        rows: Row[];
        total: number;
      };
    const other = await makeBillingCoop({ members: ['Xan Other'] });
    const writes = async () => [
      await countRows('payments'),
      await countRows('refunds'),
      await countRows('member_credits'),
      await countRows('audit_events'),
    ];
    const before = await writes();

    const all = await list('pageSize=200');
    expect(all.total).toBe(await countRows('payments', 'coop_id = $1', [c.coop.id]));
    expect(all.rows).toHaveLength(all.total);
    const order = all.rows.map((r) => [r.receivedOn, r.id] as const);
    expect(order).toEqual([...order].sort((a, b) => (a[0] === b[0] ? b[1] - a[1] : a[0] < b[0] ? 1 : -1)));
    expect(all.rows.every((r) => NAMES.includes(r.memberName))).toBe(true);
    // The refunded payments carry their refunds.
    expect(
      all.rows
        .filter((r) => r.refunds.length > 0)
        .map((r) => r.refunds.reduce((s, f) => s + f.amountCents, 0))
        .sort((a, b) => a - b),
    ).toEqual([500, 1000]);

    const second = await list('pageSize=1&page=2');
    expect(second.total).toBe(all.total);
    expect(second.rows.map((r) => r.id)).toEqual([all.rows[1]!.id]);
    const ofP = await list(`period=${P}&pageSize=200`);
    expect(ofP.rows.map((r) => r.id)).toEqual(all.rows.filter((r) => r.period === P).map((r) => r.id));
    const unmatched = await list('unmatched=1&pageSize=200');
    expect(unmatched.rows.map((r) => r.id)).toEqual(all.rows.filter((r) => r.unallocatedCents > 0).map((r) => r.id));
    expect(unmatched.total).toBe(await countRows('payments', 'coop_id = $1 AND unallocated_cents > 0', [c.coop.id]));

    // A member is refused; another co-op's treasurer sees none of these payments.
    expect((await agents['Pat Payer']!.get(`/api/coops/${slug}/billing/payments`)).status).toBe(403);
    expect(
      (await other.treasurerAgent.get(`/api/coops/${other.coop.slug}/billing/payments`).expect(200)).body,
    ).toMatchObject({ rows: [], total: 0 });
    expect((await other.treasurerAgent.get(`/api/coops/${slug}/billing/payments`)).status).toBe(404);
    expect(await writes()).toEqual(before);
  });

  it('an adjustment stays on the pending list while only a draft carries it, and leaves it once that invoice is issued', async () => {
    const m = c.members['Wyn Wrong']!.membershipId;
    const pending = async () =>
      (await c.treasurerAgent.get(`/api/coops/${slug}/billing/adjustments`).expect(200)).body.adjustments as {
        id: number;
        memberName: string;
        billedOn: string | null;
      }[];
    const made = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/adjustments`)
      .send({ memberId: m, amount: '3.25', description: 'Spare jerry can', period: NOW });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    expect(made.body).toMatchObject({
      memberId: m,
      memberName: 'Wyn Wrong',
      amountCents: 325,
      period: NOW,
      billedOn: null,
    });
    expect((await pending()).map((a) => a.id)).toContain(made.body.id);
    await runMonth(c.treasurerAgent, slug, NOW, [m]);
    expect((await pending()).map((a) => a.id)).toContain(made.body.id);
    await issueMonth(c.treasurerAgent, slug, NOW);
    expect((await pending()).map((a) => a.id)).not.toContain(made.body.id);
    const wyn = (await invoicesOf(c.coop.id, NOW)).find((r) => r.membership_id === m)!;
    expect(Number(wyn.total_cents)).toBe(2000 + 325);
  });
  it('a card refund while the payment service is down stays pending, blocks the close, and a retry refunds once', async () => {
    const wynInvoice = (await invoicesOf(c.coop.id, NOW)).find(
      (r) => r.membership_id === c.members['Wyn Wrong']!.membershipId,
    )!;
    expect((await pay('Wyn Wrong', 'test-approved', wynInvoice.id)).status).toBe(200);
    await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/invoices/${wynInvoice.id}/void`)
      .send({ reason: 'Billed in error' })
      .expect(200);
    const [p] = await sql<{ id: number }>(`SELECT id FROM payments WHERE invoice_id = $1`, [wynInvoice.id]);

    await setOutage(true, '503');
    const down = await c.treasurerAgent
      .post(`/api/coops/${slug}/billing/payments/${p!.id}/refunds`)
      .send({ amount: '3.00', reason: 'Jerry can returned' });
    await setOutage(false);
    expect(down.status).toBe(503);
    expect(down.body.code).toBe('provider-unavailable');
    const [r] = await sql<{ id: number; status: string; idempotency_key: string }>(
      `SELECT id, status, idempotency_key FROM refunds WHERE payment_id = $1`,
      [p!.id],
    );
    expect(r).toMatchObject({ status: 'pending' });
    const recon = (await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${NOW}/reconciliation`).expect(200))
      .body;
    expect(recon.pendingRefunds).toBe(1);
    expect(recon.blockers).toContain('1 card refund(s) are still waiting for the payment service.');

    const retried = await c.treasurerAgent.post(`/api/coops/${slug}/billing/refunds/${r!.id}/retry`).send({});
    expect(retried.status, JSON.stringify(retried.body)).toBe(200);
    expect(retried.body).toMatchObject({
      id: p!.id,
      refundedCents: 300,
      refunds: [expect.objectContaining({ id: r!.id, amountCents: 300, status: 'succeeded' })],
    });
    expect((await c.treasurerAgent.post(`/api/coops/${slug}/billing/refunds/${r!.id}/retry`).send({})).status).toBe(
      409,
    );
    expect(await countRows('refunds', 'payment_id = $1', [p!.id])).toBe(1);
    const [again] = await sql<{ idempotency_key: string }>(`SELECT idempotency_key FROM refunds WHERE id = $1`, [
      r!.id,
    ]);
    expect(again!.idempotency_key).toBe(r!.idempotency_key);
    expect(
      (await c.treasurerAgent.get(`/api/coops/${slug}/billing/periods/${NOW}/reconciliation`).expect(200)).body
        .pendingRefunds,
    ).toBe(0);
  });
});
