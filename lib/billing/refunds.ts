import 'server-only';
import crypto from 'node:crypto';
import type { InferAttributes, Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, notFound, invalidFields } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { refundCharge } from '@/lib/payments';
import { MemberCredit, Payment, Refund } from '@/models';
import { lockCoopBilling } from './locks';
import { cents } from './cents';
import { lockPayment } from './payments';
import { findPayment } from './payments-read';
import { todayIn } from '@/lib/dates';
import { takeNextId } from './queries';
import type { PaymentDTO } from './types';

// Refunds of money held for a member: recorded at once for cash and cheques, driven through the
// card provider (with a stored idempotency key) for card payments, and confirmed or reversed by
// its answer.

/** A refund as the provider paths need it: its money split, and the card charge it gives back from (null for cash and cheques). */
type RefundToDrive = Pick<
  InferAttributes<Refund>,
  | 'id'
  | 'paymentId'
  | 'membershipId'
  | 'amountCents'
  | 'fromUnallocatedCents'
  | 'fromCreditCents'
  | 'status'
  | 'idempotencyKey'
> & {
  stripeChargeId: string | null;
};

/** Undoes a refund's hold on the money when the provider refused it (once: only a pending refund is reversed). */
async function reverseRefund(t: Transaction, coopId: number, r: RefundToDrive, message: string): Promise<void> {
  const [n] = await Refund.update(
    { status: 'failed', failureMessage: message.slice(0, 240), completedAt: new Date() },
    { where: { id: r.id, coopId, status: 'pending' }, transaction: t },
  );
  if (n === 0) return;
  await Payment.increment(
    {
      unallocatedCents: cents(r.fromUnallocatedCents),
      creditedCents: cents(r.fromCreditCents),
      refundedCents: -cents(r.amountCents),
    },
    { where: { id: r.paymentId, coopId }, transaction: t },
  );
  if (cents(r.fromCreditCents) > 0) {
    await MemberCredit.create(
      {
        coopId,
        membershipId: r.membershipId,
        amountCents: cents(r.fromCreditCents),
        kind: 'refund-reversed',
        paymentId: r.paymentId,
        refundId: r.id,
      },
      { transaction: t },
    );
  }
}

/** Marks a card refund done (from the API answer or a webhook); idempotent. */
export async function confirmRefund(
  t: Transaction,
  coopId: number,
  refundId: number,
  providerRefundId: string,
): Promise<'applied' | 'no-change'> {
  const [n] = await Refund.update(
    { status: 'succeeded', stripeRefundId: providerRefundId, completedAt: new Date() },
    { where: { id: refundId, coopId, status: 'pending' }, transaction: t },
  );
  return n > 0 ? 'applied' : 'no-change';
}

/** One refund of the co-op with the card charge of its payment (null when it is not theirs). */
async function findRefundToDrive(coopId: number, refundId: number): Promise<RefundToDrive | null> {
  const r = await Refund.findOne({
    attributes: [
      'id',
      'paymentId',
      'membershipId',
      'amountCents',
      'fromUnallocatedCents',
      'fromCreditCents',
      'status',
      'idempotencyKey',
    ],
    where: { id: refundId, coopId },
    include: [{ model: Payment, as: 'payment', attributes: ['stripeChargeId'], required: true }],
  });
  if (!r) return null;
  const { id, paymentId, membershipId, amountCents, fromUnallocatedCents, fromCreditCents, status, idempotencyKey } = r;
  return {
    id,
    paymentId,
    membershipId,
    amountCents,
    fromUnallocatedCents,
    fromCreditCents,
    status,
    idempotencyKey,
    stripeChargeId: r.payment?.stripeChargeId ?? null,
  };
}

/** Sends a pending card refund to the provider (same idempotency key every time) and records the answer. */
async function driveCardRefund(coopId: number, r: RefundToDrive, actorUserId: number): Promise<void> {
  const outcome = await refundCharge({
    chargeId: r.stripeChargeId!,
    amountCents: cents(r.amountCents),
    metadata: { coop_id: String(coopId), refund_id: String(r.id), payment_id: String(r.paymentId) },
    idempotencyKey: r.idempotencyKey!,
  });
  if (outcome.outcome === 'succeeded') {
    await inTransaction(async (t) => {
      await lockCoopBilling(t, coopId);
      await confirmRefund(t, coopId, r.id, outcome.refund.id);
    });
    return;
  }
  if (outcome.outcome === 'rejected') {
    await inTransaction(async (t) => {
      await lockCoopBilling(t, coopId);
      await reverseRefund(t, coopId, r, outcome.message);
      await audit(
        {
          coopId,
          actorUserId,
          action: 'refund.failed',
          entityType: 'refund',
          entityId: r.id,
          after: { message: outcome.message },
        },
        t,
      );
    });
    throw new HttpError(409, `The card payment service refused the refund: ${outcome.message}`);
  }
  throw new HttpError(
    503,
    'The card payment service is not answering. The refund is recorded as pending; it completes when the service confirms it, or press “Retry refund” later — the member is never refunded twice.',
    undefined,
    {
      code: 'provider-unavailable',
    },
  );
}

/**
 * Refunds money held for a member: first from the payment's unmatched part, then from the
 * credit it created (while the member still has that credit). Card payments are refunded
 * through the provider with an idempotency key stored before the call; cash and cheque refunds
 * are recorded as done.
 */
export async function refundPayment(
  actor: Actor,
  paymentId: number,
  input: { amountCents: number; reason: string },
): Promise<PaymentDTO> {
  const coopId = actor.coop.id;
  const refund = await inTransaction(async (t): Promise<RefundToDrive> => {
    await lockCoopBilling(t, coopId);
    const p = await lockPayment(t, coopId, paymentId);
    const balance =
      (await MemberCredit.sum('amountCents', { where: { coopId, membershipId: p.membershipId }, transaction: t })) ?? 0;
    const fromUnallocated = Math.min(input.amountCents, cents(p.unallocatedCents));
    const fromCredit = input.amountCents - fromUnallocated;
    const creditRoom = Math.max(0, Math.min(cents(p.creditedCents), balance));
    if (fromCredit > creditRoom) {
      throw invalidFields({
        amount: [
          `At most ${formatCents(fromUnallocated + creditRoom, actor.coop.currency)} of this payment is held for the member. Money applied to an invoice is given back by voiding the invoice first.`,
        ],
      });
    }
    const isCard = p.method === 'card';
    // A card refund's key is derived from its own row id, taken first, and stored before the provider is called.
    const id = isCard ? await takeNextId('refunds', t) : undefined;
    const r = await Refund.create(
      {
        ...(id === undefined ? {} : { id }),
        coopId,
        paymentId,
        membershipId: p.membershipId,
        amountCents: input.amountCents,
        fromUnallocatedCents: fromUnallocated,
        fromCreditCents: fromCredit,
        status: isCard ? 'pending' : 'succeeded',
        idempotencyKey: id === undefined ? null : `refund-${id}-${crypto.randomBytes(6).toString('hex')}`,
        reason: input.reason,
        refundedOn: todayIn(actor.coop.timezone),
        createdByUserId: actor.user.id,
        completedAt: isCard ? null : new Date(),
      },
      { transaction: t },
    );
    await Payment.increment(
      { unallocatedCents: -fromUnallocated, creditedCents: -fromCredit, refundedCents: input.amountCents },
      { where: { id: paymentId, coopId }, transaction: t },
    );
    if (fromCredit > 0) {
      await MemberCredit.create(
        {
          coopId,
          membershipId: p.membershipId,
          amountCents: -fromCredit,
          kind: 'refund',
          paymentId,
          refundId: r.id,
          createdByUserId: actor.user.id,
        },
        { transaction: t },
      );
    }
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'refund.create',
        entityType: 'refund',
        entityId: r.id,
        before: { paymentId, unallocatedCents: cents(p.unallocatedCents), creditedCents: cents(p.creditedCents) },
        after: {
          paymentId,
          amountCents: input.amountCents,
          fromUnallocatedCents: fromUnallocated,
          fromCreditCents: fromCredit,
          method: p.method,
          reason: input.reason,
        },
      },
      t,
    );
    return {
      id: r.id,
      paymentId,
      membershipId: p.membershipId,
      amountCents: r.amountCents,
      fromUnallocatedCents: r.fromUnallocatedCents,
      fromCreditCents: r.fromCreditCents,
      status: r.status,
      idempotencyKey: r.idempotencyKey,
      stripeChargeId: p.stripeChargeId,
    };
  });
  if (refund.stripeChargeId) await driveCardRefund(coopId, refund, actor.user.id);
  return (await findPayment(coopId, paymentId))!;
}

/** Sends a pending card refund again (after the provider was unreachable). */
export async function retryRefund(actor: Actor, refundId: number): Promise<PaymentDTO> {
  const r = await findRefundToDrive(actor.coop.id, refundId);
  if (!r) throw notFound('Refund not found.');
  if (r.status !== 'pending' || !r.stripeChargeId) throw conflict('Only a pending card refund can be retried.');
  await driveCardRefund(actor.coop.id, r, actor.user.id);
  return (await findPayment(actor.coop.id, r.paymentId))!;
}
