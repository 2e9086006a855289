import 'server-only';
import type { InferAttributes, Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, notFound, invalidFields } from '@/lib/http';
import { Invoice, MemberCredit, Payment } from '@/models';
import { assertMember } from './invoices';
import { assertPeriodOpen, lockCoopBilling } from './locks';
import { cents } from './cents';
import { findPayment, refreshInvoicePaid } from './payments-read';
import { todayIn } from '@/lib/dates';
import type { PaymentDTO } from './types';

// Money received: recording cash and cheques, and allocating a payment to an invoice or to member
// credit. Refunds are in ./refunds.

/** What the money paths read of a payment they hold locked. */
type LockedPayment = Pick<
  InferAttributes<Payment>,
  | 'id'
  | 'membershipId'
  | 'invoiceId'
  | 'method'
  | 'amountCents'
  | 'appliedCents'
  | 'creditedCents'
  | 'unallocatedCents'
  | 'refundedCents'
  | 'period'
  | 'stripeChargeId'
>;

/** Reads a payment of the co-op and locks its row until the transaction ends (404 when not theirs). */
export async function lockPayment(t: Transaction, coopId: number, id: number): Promise<LockedPayment> {
  const p = await Payment.findOne({
    attributes: [
      'id',
      'membershipId',
      'invoiceId',
      'method',
      'amountCents',
      'appliedCents',
      'creditedCents',
      'unallocatedCents',
      'refundedCents',
      'period',
      'stripeChargeId',
    ],
    where: { id, coopId },
    lock: t.LOCK.UPDATE,
    raw: true,
    transaction: t,
  });
  if (!p) throw notFound('Payment not found.');
  return p;
}

/**
 * Allocates a payment's unmatched money: to an invoice of the same member up to what it still
 * owes (the rest becomes member credit), or — with invoiceId null — all to member credit. When
 * the invoice is no longer open (paid meanwhile, voided) everything goes to credit. Inside the
 * caller's transaction, under the co-op's billing lock.
 */
export async function allocatePayment(
  t: Transaction,
  coopId: number,
  paymentId: number,
  invoiceId: number | null,
  userId: number | null,
): Promise<{ appliedCents: number; creditedCents: number }> {
  const p = await lockPayment(t, coopId, paymentId);
  const money = cents(p.unallocatedCents);
  if (money <= 0) return { appliedCents: 0, creditedCents: 0 };
  let applied = 0;
  if (invoiceId !== null) {
    const inv = await Invoice.findOne({
      attributes: ['status', 'kind', 'totalCents', 'paidCents'],
      where: { id: invoiceId, coopId, membershipId: p.membershipId },
      lock: t.LOCK.UPDATE,
      raw: true,
      transaction: t,
    });
    if (inv && inv.kind === 'invoice' && (inv.status === 'issued' || inv.status === 'partly-paid')) {
      applied = Math.min(money, Math.max(0, cents(inv.totalCents) - cents(inv.paidCents)));
    }
  }
  const credited = money - applied;
  // One UPDATE moves the money between the parts, so amount = applied + credited + unallocated + refunded holds throughout.
  await Payment.update(
    {
      ...(invoiceId === null ? {} : { invoiceId }),
      appliedCents: cents(p.appliedCents) + applied,
      creditedCents: cents(p.creditedCents) + credited,
      unallocatedCents: 0,
    },
    { where: { id: paymentId, coopId }, transaction: t },
  );
  if (invoiceId !== null && applied > 0) await refreshInvoicePaid(t, coopId, invoiceId);
  if (credited > 0) {
    await MemberCredit.create(
      {
        coopId,
        membershipId: p.membershipId,
        amountCents: credited,
        kind: 'overpayment',
        paymentId,
        invoiceId,
        createdByUserId: userId,
      },
      { transaction: t },
    );
  }
  return { appliedCents: applied, creditedCents: credited };
}

/** Checks that an invoice of the member can take a payment (422 otherwise). */
async function assertPayableInvoice(
  t: Transaction,
  coopId: number,
  membershipId: number,
  invoiceId: number,
): Promise<void> {
  const inv = await Invoice.findOne({
    attributes: ['status', 'kind', 'membershipId'],
    where: { id: invoiceId, coopId },
    raw: true,
    transaction: t,
  });
  if (!inv || inv.kind !== 'invoice' || inv.status === 'draft' || inv.membershipId !== membershipId) {
    throw invalidFields({
      invoiceId: ['Choose an issued invoice of this member.'],
    });
  }
  if (inv.status === 'paid')
    throw invalidFields({
      invoiceId: ['That invoice is already paid; leave the invoice empty to hold the money as credit.'],
    });
  if (inv.status === 'void') throw invalidFields({ invoiceId: ['That invoice is void.'] });
}

/**
 * Records cash or a cheque the treasurer received. With an invoice it is applied at once (any
 * excess becomes member credit); without, it waits unmatched for the reconciliation screen.
 * Refused (409) when the day received falls in a closed month.
 */
export async function recordPayment(
  actor: Actor,
  input: {
    memberId: number;
    invoiceId?: number | null;
    method: 'cash' | 'cheque';
    amountCents: number;
    receivedOn: string;
    reference?: string | null;
    note?: string | null;
  },
): Promise<PaymentDTO> {
  const coopId = actor.coop.id;
  if (input.receivedOn > todayIn(actor.coop.timezone))
    throw invalidFields({
      receivedOn: ['The day received cannot be in the future.'],
    });
  const id = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertMember(coopId, input.memberId, t);
    const period = `${input.receivedOn.slice(0, 7)}-01`;
    await assertPeriodOpen(coopId, period, t);
    if (input.invoiceId) await assertPayableInvoice(t, coopId, input.memberId, input.invoiceId);
    const p = await Payment.create(
      {
        coopId,
        membershipId: input.memberId,
        method: input.method,
        amountCents: input.amountCents,
        unallocatedCents: input.amountCents,
        receivedOn: input.receivedOn,
        period,
        reference: input.reference ?? null,
        note: input.note ?? null,
        recordedByUserId: actor.user.id,
      },
      { transaction: t },
    );
    const alloc = input.invoiceId ? await allocatePayment(t, coopId, p.id, input.invoiceId, actor.user.id) : null;
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'payment.record',
        entityType: 'payment',
        entityId: p.id,
        after: {
          memberId: input.memberId,
          method: input.method,
          amountCents: input.amountCents,
          receivedOn: input.receivedOn,
          reference: input.reference ?? null,
          invoiceId: input.invoiceId ?? null,
          ...alloc,
        },
      },
      t,
    );
    return p.id;
  });
  return (await findPayment(coopId, id))!;
}

/** Matches an unmatched payment by hand: to an invoice of the payer, or (null) to member credit. */
export async function matchPayment(actor: Actor, paymentId: number, invoiceId: number | null): Promise<PaymentDTO> {
  const coopId = actor.coop.id;
  await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const p = await lockPayment(t, coopId, paymentId);
    await assertPeriodOpen(coopId, p.period, t);
    if (cents(p.unallocatedCents) <= 0) throw conflict('This payment is already matched.');
    if (invoiceId !== null) await assertPayableInvoice(t, coopId, p.membershipId, invoiceId);
    const alloc = await allocatePayment(t, coopId, paymentId, invoiceId, actor.user.id);
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'payment.match',
        entityType: 'payment',
        entityId: paymentId,
        before: { invoiceId: p.invoiceId, unallocatedCents: cents(p.unallocatedCents) },
        after: { invoiceId, ...alloc },
      },
      t,
    );
  });
  return (await findPayment(coopId, paymentId))!;
}
