import 'server-only';
import crypto from 'node:crypto';
import type { Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { conflict, HttpError, notFound } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { chargeCard, type ProviderCharge } from '@/lib/payments';
import { sequelize } from '@/models';
import { exec, int, select } from './db';
import { getInvoiceDetail } from './invoices';
import { lockCoopBilling } from './locks';
import { allocatePayment } from './payments';
import { invoiceLabel, todayIn } from './periods';
import type { InvoiceDetail } from './types';

/** How long one request owns an attempt while it talks to the provider (then a retry may take over). */
const LEASE_SECONDS = 30;
/** The smallest card charge in USD and most two-decimal currencies (Stripe's documented minimum, 50 cents). */
export const MIN_CARD_CHARGE_CENTS = 50;

interface AttemptRow {
  id: number; invoice_id: number; membership_id: number; amount_cents: string; currency: string; card_token: string;
  idempotency_key: string; status: 'pending' | 'succeeded' | 'failed'; lease_until: Date | null;
}

/**
 * Records a succeeded charge exactly once, whichever path reports it first (the API answer or a
 * webhook, in any order, any number of times): the attempt moves pending/failed → succeeded (never
 * back), one payment row is written (UNIQUE attempt and charge ids) and applied to the invoice —
 * any excess, or all of it if the invoice was voided or paid meanwhile, becomes member credit.
 * @returns 'applied' when this call recorded it, 'no-change' when it was already recorded
 */
export async function completeAttemptSucceeded(t: Transaction, coopId: number, attemptId: number, charge: ProviderCharge, userId: number | null): Promise<'applied' | 'no-change' | 'unknown'> {
  await lockCoopBilling(t, coopId);
  const [a] = await select<AttemptRow & { timezone: string }>(
    `SELECT a.*, c.timezone FROM payment_attempts a JOIN coops c ON c.id = a.coop_id WHERE a.id = $id AND a.coop_id = $coopId FOR UPDATE OF a`,
    { id: attemptId, coopId },
    t,
  );
  if (!a) return 'unknown';
  if (a.status === 'succeeded') return 'no-change';
  await exec(
    `UPDATE payment_attempts SET status = 'succeeded', stripe_charge_id = $chargeId, completed_at = now(), lease_until = NULL,
       failure_code = NULL, failure_message = NULL, updated_at = now() WHERE id = $id`,
    { id: attemptId, chargeId: charge.id },
    t,
  );
  const today = todayIn(a.timezone);
  const [p] = await select<{ id: number }>(
    `INSERT INTO payments (coop_id, membership_id, method, amount_cents, unallocated_cents, received_on, period, reference, stripe_charge_id, payment_attempt_id, recorded_by_user_id)
     VALUES ($coopId, $m, 'card', $amount, $amount, $today::date, date_trunc('month', $today::date)::date, $ref, $chargeId, $attemptId, $userId)
     ON CONFLICT DO NOTHING RETURNING id`,
    { coopId, m: a.membership_id, amount: charge.amountCents, today, ref: charge.cardLabel?.slice(0, 60) ?? null, chargeId: charge.id, attemptId, userId },
    t,
  );
  if (!p) return 'no-change';
  const alloc = await allocatePayment(t, coopId, p.id, a.invoice_id, userId);
  await audit({
    coopId, actorUserId: userId, action: 'payment.card.succeeded', entityType: 'payment', entityId: p.id,
    before: { attemptId, status: a.status }, after: { attemptId, chargeId: charge.id, amountCents: charge.amountCents, invoiceId: a.invoice_id, ...alloc },
  }, t);
  return 'applied';
}

/** Marks an attempt declined; never overrides a success. */
export async function markAttemptFailed(t: Transaction, coopId: number, attemptId: number, code: string, message: string): Promise<'applied' | 'no-change'> {
  const n = await exec(
    `UPDATE payment_attempts SET status = 'failed', failure_code = $code, failure_message = $message, completed_at = now(), lease_until = NULL, updated_at = now()
     WHERE id = $id AND coop_id = $coopId AND status = 'pending'`,
    { id: attemptId, coopId, code: code.slice(0, 60), message: message.slice(0, 240) },
    t,
  );
  return n > 0 ? 'applied' : 'no-change';
}

/**
 * A member pays their own invoice by card, charged at most once however often they click:
 *  1. under the co-op's billing lock, the invoice's one open attempt is found or created, with its
 *     idempotency key (`payment-attempt-<id>-<salt>`) committed BEFORE the provider is called; an
 *     attempt another request is working on right now → 409;
 *  2. the provider is called with that key (an earlier attempt is replayed with its own card and
 *     amount, so the provider answers with the first result instead of charging again);
 *  3. the answer is recorded: success → payment applied; decline → attempt failed (a new click
 *     starts a fresh attempt); provider unreachable → attempt stays open for a later retry or the
 *     provider's webhook, and the member is told the invoice is still unpaid.
 */
export async function payInvoiceByCard(actor: Actor, invoiceId: number, cardToken: string): Promise<{ status: 'succeeded'; invoice: InvoiceDetail }> {
  const coopId = actor.coop.id;
  const attempt = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const [inv] = await select<{ id: number; kind: string; status: string; total_cents: string; paid_cents: string; number: number }>(
      `SELECT id, kind, status, total_cents, paid_cents, number FROM invoices
       WHERE id = $id AND coop_id = $coopId AND membership_id = $m AND status <> 'draft' FOR UPDATE`,
      { id: invoiceId, coopId, m: actor.membershipId },
      t,
    );
    if (!inv) throw notFound('Invoice not found.');
    if (inv.kind !== 'invoice') throw conflict('A credit note is not paid; its amount is already on your account.');
    if (inv.status === 'paid') throw conflict('This invoice is already paid.', { code: 'already-paid' });
    if (inv.status === 'void') throw conflict('This invoice was voided; see the credit note and any newer invoice.');
    const [open] = await select<AttemptRow>(`SELECT * FROM payment_attempts WHERE invoice_id = $id AND status = 'pending' FOR UPDATE`, { id: invoiceId }, t);
    if (open) {
      if (open.lease_until && new Date(open.lease_until).getTime() > Date.now()) {
        throw conflict('A payment for this invoice is already being processed. Wait a moment and reload the page.', { code: 'in-progress' });
      }
      await exec(`UPDATE payment_attempts SET lease_until = now() + make_interval(secs => $s), updated_at = now() WHERE id = $id`, { id: open.id, s: LEASE_SECONDS }, t);
      return open;
    }
    const outstanding = int(inv.total_cents) - int(inv.paid_cents);
    if (outstanding < MIN_CARD_CHARGE_CENTS) {
      throw new HttpError(422, 'Some fields need attention.', { card: [`Amounts under ${formatCents(MIN_CARD_CHARGE_CENTS, actor.coop.currency)} cannot be paid by card; please pay the treasurer in cash.`] });
    }
    // The key names the row it belongs to: the id and the key come from the same nextval.
    const [row] = await select<AttemptRow>(
      `INSERT INTO payment_attempts (id, coop_id, invoice_id, membership_id, amount_cents, currency, card_token, idempotency_key, lease_until, created_by_user_id)
       SELECT n.id, $coopId, $invoiceId, $m, $amount, $currency, $token, 'payment-attempt-' || n.id || '-' || $salt, now() + make_interval(secs => $s), $userId
       FROM (SELECT nextval('payment_attempts_id_seq') AS id) n
       RETURNING *`,
      { coopId, invoiceId, m: actor.membershipId, amount: outstanding, currency: actor.coop.currency, token: cardToken, salt: crypto.randomBytes(6).toString('hex'), s: LEASE_SECONDS, userId: actor.user.id },
      t,
    );
    await audit({ coopId, actorUserId: actor.user.id, action: 'payment.attempt.start', entityType: 'payment_attempt', entityId: row!.id, after: { invoiceId, amountCents: outstanding, idempotencyKey: row!.idempotency_key } }, t);
    return row!;
  });

  const outcome = await chargeCard({
    amountCents: int(attempt.amount_cents),
    currency: attempt.currency,
    cardToken: attempt.card_token,
    description: `${actor.coop.name} — invoice ${invoiceLabel('invoice', (await invoiceNumber(coopId, invoiceId)) ?? null) ?? invoiceId}`,
    metadata: { coop_id: String(coopId), invoice_id: String(invoiceId), payment_attempt_id: String(attempt.id) },
    idempotencyKey: attempt.idempotency_key,
  });

  if (outcome.outcome === 'succeeded') {
    await sequelize.transaction((t) => completeAttemptSucceeded(t, coopId, attempt.id, outcome.charge, actor.user.id));
    return { status: 'succeeded', invoice: await getInvoiceDetail(coopId, invoiceId, { membershipId: actor.membershipId, includeDrafts: false }) };
  }
  if (outcome.outcome === 'declined' || outcome.outcome === 'rejected') {
    await sequelize.transaction(async (t) => {
      await lockCoopBilling(t, coopId);
      await markAttemptFailed(t, coopId, attempt.id, outcome.outcome === 'declined' ? outcome.code : 'rejected', outcome.message);
      await audit({ coopId, actorUserId: actor.user.id, action: 'payment.attempt.failed', entityType: 'payment_attempt', entityId: attempt.id, after: { outcome: outcome.outcome, message: outcome.message } }, t);
    });
    if (outcome.outcome === 'declined') throw new HttpError(402, `Your card was not accepted: ${outcome.message} Nothing was charged. Try another card, or pay the treasurer in cash.`, undefined, { code: 'card-declined' });
    throw new HttpError(502, `The card payment service refused this payment (${outcome.message}). Nothing was charged.`, undefined, { code: 'provider-rejected' });
  }
  await exec(`UPDATE payment_attempts SET lease_until = NULL, updated_at = now() WHERE id = $id AND status = 'pending'`, { id: attempt.id });
  throw new HttpError(
    503,
    'We could not reach the card payment service, so your invoice still shows as unpaid. Please try again in a few minutes — you will not be charged twice. If the payment did go through, it will appear here by itself.',
    undefined,
    { code: 'provider-unavailable' },
  );
}

async function invoiceNumber(coopId: number, invoiceId: number): Promise<number | null> {
  const [r] = await select<{ number: number | null }>('SELECT number FROM invoices WHERE id = $id AND coop_id = $coopId', { id: invoiceId, coopId });
  return r?.number ?? null;
}
