import 'server-only';
import crypto from 'node:crypto';
import type { Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { conflict, HttpError, notFound } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { refundCharge } from '@/lib/payments';
import { sequelize } from '@/models';
import { exec, int, select } from './db';
import { assertMember } from './invoices';
import { assertPeriodOpen, lockCoopBilling } from './locks';
import { findPayment, refreshInvoicePaid } from './payments-read';
import { todayIn } from './periods';
import type { PaymentDTO, RefundDTO } from './types';

interface PaymentLockRow {
  id: number; membership_id: number; invoice_id: number | null; method: string; amount_cents: string; applied_cents: string;
  credited_cents: string; unallocated_cents: string; refunded_cents: string; period: string; stripe_charge_id: string | null;
}

async function lockPayment(t: Transaction, coopId: number, id: number): Promise<PaymentLockRow> {
  const [p] = await select<PaymentLockRow>(
    `SELECT id, membership_id, invoice_id, method, amount_cents, applied_cents, credited_cents, unallocated_cents, refunded_cents,
            to_char(period, 'YYYY-MM-DD') AS period, stripe_charge_id
     FROM payments WHERE id = $id AND coop_id = $coopId FOR UPDATE`,
    { id, coopId },
    t,
  );
  if (!p) throw notFound('Payment not found.');
  return p;
}

/**
 * Allocates a payment's unmatched money: to an invoice of the same member up to what it still
 * owes (the rest becomes member credit), or — with invoiceId null — all to member credit. When
 * the invoice is no longer open (paid meanwhile, voided) everything goes to credit. Inside the
 * caller's transaction, under the co-op's billing lock.
 */
export async function allocatePayment(t: Transaction, coopId: number, paymentId: number, invoiceId: number | null, userId: number | null): Promise<{ appliedCents: number; creditedCents: number }> {
  const p = await lockPayment(t, coopId, paymentId);
  const money = int(p.unallocated_cents);
  if (money <= 0) return { appliedCents: 0, creditedCents: 0 };
  let applied = 0;
  if (invoiceId !== null) {
    const [inv] = await select<{ status: string; total_cents: string; paid_cents: string; kind: string }>(
      'SELECT status, total_cents, paid_cents, kind FROM invoices WHERE id = $id AND coop_id = $coopId AND membership_id = $m FOR UPDATE',
      { id: invoiceId, coopId, m: p.membership_id },
      t,
    );
    if (inv && inv.kind === 'invoice' && (inv.status === 'issued' || inv.status === 'partly-paid')) {
      applied = Math.min(money, Math.max(0, int(inv.total_cents) - int(inv.paid_cents)));
    }
  }
  const credited = money - applied;
  await exec(
    `UPDATE payments SET invoice_id = COALESCE($invoiceId, invoice_id), applied_cents = applied_cents + $applied, credited_cents = credited_cents + $credited,
       unallocated_cents = 0, updated_at = now() WHERE id = $id`,
    { id: paymentId, invoiceId, applied, credited },
    t,
  );
  if (invoiceId !== null && applied > 0) await refreshInvoicePaid(t, coopId, invoiceId);
  if (credited > 0) {
    await exec(
      `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, payment_id, invoice_id, created_by_user_id) VALUES ($coopId, $m, $credited, 'overpayment', $pid, $invoiceId, $userId)`,
      { coopId, m: p.membership_id, credited, pid: paymentId, invoiceId, userId },
      t,
    );
  }
  return { appliedCents: applied, creditedCents: credited };
}

/** Checks that an invoice of the member can take a payment (422/409 otherwise). */
async function assertPayableInvoice(t: Transaction, coopId: number, membershipId: number, invoiceId: number): Promise<void> {
  const [inv] = await select<{ status: string; kind: string; membership_id: number }>(
    'SELECT status, kind, membership_id FROM invoices WHERE id = $id AND coop_id = $coopId',
    { id: invoiceId, coopId },
    t,
  );
  if (!inv || inv.kind !== 'invoice' || inv.status === 'draft' || inv.membership_id !== membershipId) {
    throw new HttpError(422, 'Some fields need attention.', { invoiceId: ['Choose an issued invoice of this member.'] });
  }
  if (inv.status === 'paid') throw new HttpError(422, 'Some fields need attention.', { invoiceId: ['That invoice is already paid; leave the invoice empty to hold the money as credit.'] });
  if (inv.status === 'void') throw new HttpError(422, 'Some fields need attention.', { invoiceId: ['That invoice is void.'] });
}

/**
 * Records cash or a cheque the treasurer received. With an invoice it is applied at once (any
 * excess becomes member credit); without, it waits unmatched for the reconciliation screen.
 * Refused (409) when the day received falls in a closed month.
 */
export async function recordPayment(
  actor: Actor,
  input: { memberId: number; invoiceId?: number | null; method: 'cash' | 'cheque'; amountCents: number; receivedOn: string; reference?: string | null; note?: string | null },
): Promise<PaymentDTO> {
  const coopId = actor.coop.id;
  if (input.receivedOn > todayIn(actor.coop.timezone)) throw new HttpError(422, 'Some fields need attention.', { receivedOn: ['The day received cannot be in the future.'] });
  const id = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertMember(coopId, input.memberId, t);
    const period = `${input.receivedOn.slice(0, 7)}-01`;
    await assertPeriodOpen(coopId, period, t);
    if (input.invoiceId) await assertPayableInvoice(t, coopId, input.memberId, input.invoiceId);
    const [p] = await select<{ id: number }>(
      `INSERT INTO payments (coop_id, membership_id, method, amount_cents, unallocated_cents, received_on, period, reference, note, recorded_by_user_id)
       VALUES ($coopId, $m, $method, $amount, $amount, $receivedOn::date, $period::date, $reference, $note, $userId) RETURNING id`,
      { coopId, m: input.memberId, method: input.method, amount: input.amountCents, receivedOn: input.receivedOn, period, reference: input.reference ?? null, note: input.note ?? null, userId: actor.user.id },
      t,
    );
    const alloc = input.invoiceId ? await allocatePayment(t, coopId, p!.id, input.invoiceId, actor.user.id) : null;
    await audit({
      coopId, actorUserId: actor.user.id, action: 'payment.record', entityType: 'payment', entityId: p!.id,
      after: { memberId: input.memberId, method: input.method, amountCents: input.amountCents, receivedOn: input.receivedOn, reference: input.reference ?? null, invoiceId: input.invoiceId ?? null, ...alloc },
    }, t);
    return p!.id;
  });
  return (await findPayment(coopId, id))!;
}

/** Matches an unmatched payment by hand: to an invoice of the payer, or (null) to member credit. */
export async function matchPayment(actor: Actor, paymentId: number, invoiceId: number | null): Promise<PaymentDTO> {
  const coopId = actor.coop.id;
  await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const p = await lockPayment(t, coopId, paymentId);
    await assertPeriodOpen(coopId, p.period, t);
    if (int(p.unallocated_cents) <= 0) throw conflict('This payment is already matched.');
    if (invoiceId !== null) await assertPayableInvoice(t, coopId, p.membership_id, invoiceId);
    const alloc = await allocatePayment(t, coopId, paymentId, invoiceId, actor.user.id);
    await audit({ coopId, actorUserId: actor.user.id, action: 'payment.match', entityType: 'payment', entityId: paymentId, before: { invoiceId: p.invoice_id, unallocatedCents: int(p.unallocated_cents) }, after: { invoiceId, ...alloc } }, t);
  });
  return (await findPayment(coopId, paymentId))!;
}

interface RefundRow { id: number; payment_id: number; membership_id: number; amount_cents: string; from_unallocated_cents: string; from_credit_cents: string; status: RefundDTO['status']; idempotency_key: string | null; stripe_charge_id: string | null }

/** Undoes a refund's hold on the money when the provider refused it. */
async function reverseRefund(t: Transaction, coopId: number, r: RefundRow, message: string): Promise<void> {
  const n = await exec(
    `UPDATE refunds SET status = 'failed', failure_message = $message, completed_at = now(), updated_at = now() WHERE id = $id AND coop_id = $coopId AND status = 'pending'`,
    { id: r.id, coopId, message: message.slice(0, 240) },
    t,
  );
  if (n === 0) return;
  await exec(
    `UPDATE payments SET unallocated_cents = unallocated_cents + $u, credited_cents = credited_cents + $c, refunded_cents = refunded_cents - $amount, updated_at = now() WHERE id = $pid`,
    { u: int(r.from_unallocated_cents), c: int(r.from_credit_cents), amount: int(r.amount_cents), pid: r.payment_id },
    t,
  );
  if (int(r.from_credit_cents) > 0) {
    await exec(
      `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, payment_id, refund_id) VALUES ($coopId, $m, $amount, 'refund-reversed', $pid, $rid)`,
      { coopId, m: r.membership_id, amount: int(r.from_credit_cents), pid: r.payment_id, rid: r.id },
      t,
    );
  }
}

/** Marks a card refund done (from the API answer or a webhook); idempotent. */
export async function confirmRefund(t: Transaction, coopId: number, refundId: number, providerRefundId: string): Promise<'applied' | 'no-change'> {
  const n = await exec(
    `UPDATE refunds SET status = 'succeeded', stripe_refund_id = $rid, completed_at = now(), updated_at = now() WHERE id = $id AND coop_id = $coopId AND status = 'pending'`,
    { id: refundId, coopId, rid: providerRefundId },
    t,
  );
  return n > 0 ? 'applied' : 'no-change';
}

async function loadRefund(t: Transaction | undefined, coopId: number, refundId: number): Promise<RefundRow | null> {
  const [r] = await select<RefundRow>(
    `SELECT r.id, r.payment_id, r.membership_id, r.amount_cents, r.from_unallocated_cents, r.from_credit_cents, r.status, r.idempotency_key, p.stripe_charge_id
     FROM refunds r JOIN payments p ON p.id = r.payment_id WHERE r.id = $id AND r.coop_id = $coopId ${t ? 'FOR UPDATE OF r' : ''}`,
    { id: refundId, coopId },
    t,
  );
  return r ?? null;
}

/** Sends a pending card refund to the provider (same idempotency key every time) and records the answer. */
async function driveCardRefund(coopId: number, r: RefundRow, actorUserId: number): Promise<void> {
  const outcome = await refundCharge({
    chargeId: r.stripe_charge_id!,
    amountCents: int(r.amount_cents),
    metadata: { coop_id: String(coopId), refund_id: String(r.id), payment_id: String(r.payment_id) },
    idempotencyKey: r.idempotency_key!,
  });
  if (outcome.outcome === 'succeeded') {
    await sequelize.transaction(async (t) => {
      await lockCoopBilling(t, coopId);
      await confirmRefund(t, coopId, r.id, outcome.refund.id);
    });
    return;
  }
  if (outcome.outcome === 'rejected') {
    await sequelize.transaction(async (t) => {
      await lockCoopBilling(t, coopId);
      await reverseRefund(t, coopId, r, outcome.message);
      await audit({ coopId, actorUserId, action: 'refund.failed', entityType: 'refund', entityId: r.id, after: { message: outcome.message } }, t);
    });
    throw new HttpError(409, `The card payment service refused the refund: ${outcome.message}`);
  }
  throw new HttpError(503, 'The card payment service is not answering. The refund is recorded as pending; it completes when the service confirms it, or press “Retry refund” later — the member is never refunded twice.', undefined, {
    code: 'provider-unavailable',
  });
}

/**
 * Refunds money held for a member: first from the payment's unmatched part, then from the
 * credit it created (while the member still has that credit). Card payments are refunded
 * through the provider with an idempotency key stored before the call; cash and cheque refunds
 * are recorded as done.
 */
export async function refundPayment(actor: Actor, paymentId: number, input: { amountCents: number; reason: string }): Promise<PaymentDTO> {
  const coopId = actor.coop.id;
  const refund = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const p = await lockPayment(t, coopId, paymentId);
    const [bal] = await select<{ b: string }>('SELECT COALESCE(SUM(amount_cents), 0) AS b FROM member_credits WHERE coop_id = $coopId AND membership_id = $m', { coopId, m: p.membership_id }, t);
    const fromUnallocated = Math.min(input.amountCents, int(p.unallocated_cents));
    const fromCredit = input.amountCents - fromUnallocated;
    const creditRoom = Math.max(0, Math.min(int(p.credited_cents), int(bal?.b)));
    if (fromCredit > creditRoom) {
      throw new HttpError(422, 'Some fields need attention.', {
        amount: [`At most ${formatCents(fromUnallocated + creditRoom, actor.coop.currency)} of this payment is held for the member. Money applied to an invoice is given back by voiding the invoice first.`],
      });
    }
    const isCard = p.method === 'card';
    const today = todayIn(actor.coop.timezone);
    const [r] = await select<{ id: number }>(
      `INSERT INTO refunds (coop_id, payment_id, membership_id, amount_cents, from_unallocated_cents, from_credit_cents, status, reason, refunded_on, created_by_user_id, completed_at)
       VALUES ($coopId, $pid, $m, $amount, $fu, $fc, $status::varchar, $reason, $today::date, $userId, CASE WHEN $status::varchar = 'succeeded' THEN now() END) RETURNING id`,
      { coopId, pid: paymentId, m: p.membership_id, amount: input.amountCents, fu: fromUnallocated, fc: fromCredit, status: isCard ? 'pending' : 'succeeded', reason: input.reason, today, userId: actor.user.id },
      t,
    );
    if (isCard) {
      // The key is derived from our own row and stored before the provider is called.
      await exec(`UPDATE refunds SET idempotency_key = 'refund-' || id || '-' || $salt WHERE id = $id`, { id: r!.id, salt: crypto.randomBytes(6).toString('hex') }, t);
    }
    await exec(
      `UPDATE payments SET unallocated_cents = unallocated_cents - $fu, credited_cents = credited_cents - $fc, refunded_cents = refunded_cents + $amount, updated_at = now() WHERE id = $pid`,
      { fu: fromUnallocated, fc: fromCredit, amount: input.amountCents, pid: paymentId },
      t,
    );
    if (fromCredit > 0) {
      await exec(
        `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, payment_id, refund_id, created_by_user_id) VALUES ($coopId, $m, $amount, 'refund', $pid, $rid, $userId)`,
        { coopId, m: p.membership_id, amount: -fromCredit, pid: paymentId, rid: r!.id, userId: actor.user.id },
        t,
      );
    }
    await audit({
      coopId, actorUserId: actor.user.id, action: 'refund.create', entityType: 'refund', entityId: r!.id,
      before: { paymentId, unallocatedCents: int(p.unallocated_cents), creditedCents: int(p.credited_cents) },
      after: { paymentId, amountCents: input.amountCents, fromUnallocatedCents: fromUnallocated, fromCreditCents: fromCredit, method: p.method, reason: input.reason },
    }, t);
    return (await loadRefund(t, coopId, r!.id))!;
  });
  if (refund.stripe_charge_id) await driveCardRefund(coopId, refund, actor.user.id);
  return (await findPayment(coopId, paymentId))!;
}

/** Sends a pending card refund again (after the provider was unreachable). */
export async function retryRefund(actor: Actor, refundId: number): Promise<PaymentDTO> {
  const r = await loadRefund(undefined, actor.coop.id, refundId);
  if (!r) throw notFound('Refund not found.');
  if (r.status !== 'pending' || !r.stripe_charge_id) throw conflict('Only a pending card refund can be retried.');
  await driveCardRefund(actor.coop.id, r, actor.user.id);
  return (await findPayment(actor.coop.id, r.payment_id))!;
}
