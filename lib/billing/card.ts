import 'server-only';
import crypto from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { cardPaidSchema } from '@/lib/api/dto/billing';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, notFound, invalidFields } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { chargeCard, findChargeForAttempt, type ProviderCharge } from '@/lib/payments';
import { Coop, Invoice, Payment, PaymentAttempt } from '@/models';
import { getInvoiceDetail } from './invoices';
import { lockCoopBilling } from './locks';
import { allocatePayment } from './payments';
import { cents } from './cents';
import { todayIn } from '@/lib/dates';
import { invoiceLabel } from './periods';
import { takeNextId } from './queries';

/** How long one request owns an attempt while it talks to the provider (then a retry may take over). */
const LEASE_SECONDS = 30;
/** The smallest card charge in USD and most two-decimal currencies (Stripe's documented minimum, 50 cents). */
export const MIN_CARD_CHARGE_CENTS = 50;

const leaseUntil = (): Date => new Date(Date.now() + LEASE_SECONDS * 1000);

/**
 * Records a succeeded charge exactly once, whichever path reports it first (the API answer or a
 * webhook, in any order, any number of times): the attempt moves pending/failed → succeeded (never
 * back), one payment row is written (UNIQUE attempt and charge ids) and applied to the invoice —
 * any excess, or all of it if the invoice was voided or paid meanwhile, becomes member credit.
 * This is the one place a charge becomes a payment.
 * @returns 'applied' when this call recorded it, 'no-change' when it was already recorded
 */
export async function completeAttemptSucceeded(
  t: Transaction,
  coopId: number,
  attemptId: number,
  charge: ProviderCharge,
  userId: number | null,
): Promise<'applied' | 'no-change' | 'unknown'> {
  await lockCoopBilling(t, coopId);
  const a = await PaymentAttempt.findOne({
    attributes: ['id', 'invoiceId', 'membershipId', 'status'],
    where: { id: attemptId, coopId },
    lock: t.LOCK.UPDATE,
    raw: true,
    transaction: t,
  });
  const coop = a ? await Coop.findByPk(coopId, { attributes: ['timezone'], raw: true, transaction: t }) : null;
  if (!a || !coop) return 'unknown';
  if (a.status === 'succeeded') return 'no-change';
  await PaymentAttempt.update(
    {
      status: 'succeeded',
      stripeChargeId: charge.id,
      completedAt: new Date(),
      leaseUntil: null,
      failureCode: null,
      failureMessage: null,
    },
    { where: { id: attemptId, coopId }, transaction: t },
  );
  // Under the billing lock with the attempt row locked: a payment for this attempt or charge can
  // only exist if it was recorded before (the UNIQUE columns would refuse a second one anyway).
  const recorded = await Payment.count({
    where: { coopId, [Op.or]: [{ paymentAttemptId: attemptId }, { stripeChargeId: charge.id }] },
    transaction: t,
  });
  if (recorded > 0) return 'no-change';
  const today = todayIn(coop.timezone);
  const p = await Payment.create(
    {
      coopId,
      membershipId: a.membershipId,
      method: 'card',
      amountCents: charge.amountCents,
      unallocatedCents: charge.amountCents,
      receivedOn: today,
      period: `${today.slice(0, 7)}-01`,
      reference: charge.cardLabel?.slice(0, 60) ?? null,
      stripeChargeId: charge.id,
      paymentAttemptId: attemptId,
      recordedByUserId: userId,
    },
    { transaction: t },
  );
  const alloc = await allocatePayment(t, coopId, p.id, a.invoiceId, userId);
  await audit(
    {
      coopId,
      actorUserId: userId,
      action: 'payment.card.succeeded',
      entityType: 'payment',
      entityId: p.id,
      before: { attemptId, status: a.status },
      after: { attemptId, chargeId: charge.id, amountCents: charge.amountCents, invoiceId: a.invoiceId, ...alloc },
    },
    t,
  );
  return 'applied';
}

/** Marks an attempt declined; never overrides a success. */
export async function markAttemptFailed(
  t: Transaction,
  coopId: number,
  attemptId: number,
  code: string,
  message: string,
): Promise<'applied' | 'no-change'> {
  const [n] = await PaymentAttempt.update(
    {
      status: 'failed',
      failureCode: code.slice(0, 60),
      failureMessage: message.slice(0, 240),
      completedAt: new Date(),
      leaseUntil: null,
    },
    { where: { id: attemptId, coopId, status: 'pending' }, transaction: t },
  );
  return n > 0 ? 'applied' : 'no-change';
}

/**
 * A member pays their own invoice by card, charged at most once however often they click:
 *  1. under the co-op's billing lock, the invoice's one open attempt is found or created (the
 *     partial UNIQUE index allows one pending attempt per invoice), with its idempotency key
 *     (`payment-attempt-<id>-<salt>`) committed BEFORE the provider is called; an attempt another
 *     request is working on right now → 409;
 *  2. the provider is called with that key (an earlier attempt is replayed with its own card and
 *     amount, so the provider answers with the first result instead of charging again);
 *  3. the answer is recorded: success → payment applied; decline → attempt failed (a new click
 *     starts a fresh attempt); provider unreachable → attempt stays open for a later retry or the
 *     provider's webhook, and the member is told the invoice is still unpaid.
 */
export async function payInvoiceByCard(
  actor: Actor,
  invoiceId: number,
  cardToken: string,
): Promise<z.infer<typeof cardPaidSchema>> {
  const coopId = actor.coop.id;
  const { attempt, invoiceNumber } = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const inv = await Invoice.findOne({
      attributes: ['id', 'kind', 'status', 'totalCents', 'paidCents', 'number'],
      where: { id: invoiceId, coopId, membershipId: actor.membershipId, status: { [Op.ne]: 'draft' } },
      lock: t.LOCK.UPDATE,
      raw: true,
      transaction: t,
    });
    if (!inv) throw notFound('Invoice not found.');
    if (inv.kind !== 'invoice') throw conflict('A credit note is not paid; its amount is already on your account.');
    if (inv.status === 'paid') throw conflict('This invoice is already paid.', { code: 'already-paid' });
    if (inv.status === 'void') throw conflict('This invoice was voided; see the credit note and any newer invoice.');
    const open = await PaymentAttempt.findOne({
      where: { invoiceId, coopId, status: 'pending' },
      lock: t.LOCK.UPDATE,
      transaction: t,
    });
    if (open) {
      if (open.leaseUntil && open.leaseUntil.getTime() > Date.now()) {
        throw conflict('A payment for this invoice is already being processed. Wait a moment and reload the page.', {
          code: 'in-progress',
        });
      }
      await open.update({ leaseUntil: leaseUntil() }, { transaction: t });
      return { attempt: open, invoiceNumber: inv.number };
    }
    const outstanding = cents(inv.totalCents) - cents(inv.paidCents);
    if (outstanding < MIN_CARD_CHARGE_CENTS) {
      throw invalidFields({
        card: [
          `Amounts under ${formatCents(MIN_CARD_CHARGE_CENTS, actor.coop.currency)} cannot be paid by card; please pay the treasurer in cash.`,
        ],
      });
    }
    // The key names the row it belongs to: the id is taken first and both go in with one INSERT.
    const id = await takeNextId('payment_attempts', t);
    const row = await PaymentAttempt.create(
      {
        id,
        coopId,
        invoiceId,
        membershipId: actor.membershipId,
        amountCents: outstanding,
        currency: actor.coop.currency,
        cardToken,
        idempotencyKey: `payment-attempt-${id}-${crypto.randomBytes(6).toString('hex')}`,
        leaseUntil: leaseUntil(),
        createdByUserId: actor.user.id,
      },
      { transaction: t },
    );
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'payment.attempt.start',
        entityType: 'payment_attempt',
        entityId: row.id,
        after: { invoiceId, amountCents: outstanding, idempotencyKey: row.idempotencyKey },
      },
      t,
    );
    return { attempt: row, invoiceNumber: inv.number };
  });

  const outcome = await chargeCard({
    amountCents: cents(attempt.amountCents),
    currency: attempt.currency,
    cardToken: attempt.cardToken,
    description: `${actor.coop.name} — invoice ${invoiceLabel('invoice', invoiceNumber ?? null) ?? invoiceId}`,
    metadata: { coop_id: String(coopId), invoice_id: String(invoiceId), payment_attempt_id: String(attempt.id) },
    idempotencyKey: attempt.idempotencyKey,
  });

  if (outcome.outcome === 'succeeded') {
    await inTransaction((t) => completeAttemptSucceeded(t, coopId, attempt.id, outcome.charge, actor.user.id));
    return {
      status: 'succeeded',
      invoice: await getInvoiceDetail(coopId, invoiceId, { membershipId: actor.membershipId, includeDrafts: false }),
    };
  }
  if (outcome.outcome === 'declined' || outcome.outcome === 'rejected') {
    await inTransaction(async (t) => {
      await lockCoopBilling(t, coopId);
      await markAttemptFailed(
        t,
        coopId,
        attempt.id,
        outcome.outcome === 'declined' ? outcome.code : 'rejected',
        outcome.message,
      );
      await audit(
        {
          coopId,
          actorUserId: actor.user.id,
          action: 'payment.attempt.failed',
          entityType: 'payment_attempt',
          entityId: attempt.id,
          after: { outcome: outcome.outcome, message: outcome.message },
        },
        t,
      );
    });
    if (outcome.outcome === 'declined')
      throw new HttpError(
        402,
        `Your card was not accepted: ${outcome.message} Nothing was charged. Try another card, or pay the treasurer in cash.`,
        undefined,
        { code: 'card-declined' },
      );
    throw new HttpError(
      502,
      `The card payment service refused this payment (${outcome.message}). Nothing was charged.`,
      undefined,
      { code: 'provider-rejected' },
    );
  }
  await PaymentAttempt.update({ leaseUntil: null }, { where: { id: attempt.id, coopId, status: 'pending' } });
  throw new HttpError(
    503,
    'We could not reach the card payment service, so your invoice still shows as unpaid. Please try again in a few minutes — you will not be charged twice. If the payment did go through, it will appear here by itself.',
    undefined,
    { code: 'provider-unavailable' },
  );
}

/** An attempt whose answer was lost is looked up at the provider after this long. */
export const SETTLE_AFTER_MS = Number(process.env.PAYMENT_SETTLE_AFTER_SECONDS ?? 180) * 1000;

/**
 * Settles card payments whose outcome is unknown (a worker job, every minute): each attempt
 * still pending SETTLE_AFTER_MS after it started, and not being worked on by a request right now,
 * is leased, then looked up at the provider by its attempt id (charge metadata). A succeeded
 * charge is recorded through completeAttemptSucceeded (the one place a charge becomes a payment);
 * a declined one, or none at all, marks the attempt failed (nothing was charged; the member may
 * pay again — a late success would still be recorded, failed → succeeded). When the provider
 * cannot be reached, the attempt stays pending for the next run.
 * @returns how many attempts were settled
 */
export async function settleUnknownAttempts(limit = 50): Promise<number> {
  const due = await PaymentAttempt.findAll({
    attributes: ['id', 'coopId', 'createdAt'],
    where: {
      status: 'pending',
      createdAt: { [Op.lt]: new Date(Date.now() - SETTLE_AFTER_MS) },
      [Op.or]: [{ leaseUntil: null }, { leaseUntil: { [Op.lt]: new Date() } }],
    },
    order: [['id', 'ASC']],
    limit,
    raw: true,
  });
  let settled = 0;
  for (const a of due) {
    // Lease it, so a member's retry waits (409) while we ask the provider.
    const [leased] = await PaymentAttempt.update(
      { leaseUntil: leaseUntil() },
      {
        where: {
          id: a.id,
          coopId: a.coopId,
          status: 'pending',
          [Op.or]: [{ leaseUntil: null }, { leaseUntil: { [Op.lt]: new Date() } }],
        },
      },
    );
    if (leased === 0) continue;
    const found = await findChargeForAttempt(a.id, new Date(a.createdAt));
    if (found === 'unavailable') {
      await PaymentAttempt.update({ leaseUntil: null }, { where: { id: a.id, coopId: a.coopId, status: 'pending' } });
      continue;
    }
    await inTransaction(async (t) => {
      if (found && found.succeeded) {
        await completeAttemptSucceeded(t, a.coopId, a.id, found, null);
        return;
      }
      await lockCoopBilling(t, a.coopId);
      const message = found
        ? 'The card was declined.'
        : 'The card payment service has no charge for this attempt; nothing was charged.';
      if (
        (await markAttemptFailed(t, a.coopId, a.id, found ? 'card_declined' : 'not-charged', message)) === 'applied'
      ) {
        await audit(
          {
            coopId: a.coopId,
            actorUserId: null,
            action: 'payment.attempt.failed',
            entityType: 'payment_attempt',
            entityId: a.id,
            after: { outcome: found ? 'declined' : 'not-charged', settled: true },
          },
          t,
        );
      }
    });
    settled++;
  }
  return settled;
}
