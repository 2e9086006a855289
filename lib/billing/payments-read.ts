import 'server-only';
import { fn, col, Op, type InferAttributes, type Transaction, type WhereOptions } from 'sequelize';
import { BillingPeriod, Invoice, MemberCredit, Membership, Payment, Refund, User } from '@/models';
import { dateToPeriod, invoiceLabel, periodToDate } from './periods';
import type { PaymentDTO } from './types';
import type { Paged } from '@/lib/validation/list';

import { cents } from './cents';

/**
 * Runs independent reads in parallel on the pool, or one after another inside a transaction (its
 * one connection runs one statement at a time; pg would only queue them, and pg 9 refuses that).
 */
export async function readTogether<const R extends readonly (() => Promise<unknown>)[]>(
  t: Transaction | undefined,
  reads: R,
): Promise<{ -readonly [K in keyof R]: Awaited<ReturnType<R[K]>> }> {
  type Out = { -readonly [K in keyof R]: Awaited<ReturnType<R[K]>> };
  if (!t) return (await Promise.all(reads.map((read) => read()))) as Out;
  const out: unknown[] = [];
  for (const read of reads) out.push(await read());
  return out as Out;
}

/** A condition on payments (their attributes), e.g. `{ period: '2026-11-01', unallocatedCents: { [Op.gt]: 0 } }`. */
export type PaymentWhere = WhereOptions<InferAttributes<Payment>>;

/**
 * How much of a payment may still be refunded: its unmatched part, plus the part it put into the
 * member's credit as long as that credit has not been spent. Money applied to an invoice is not
 * refunded directly — void the invoice first (its payments become credit) or add an adjustment.
 */
export function refundableCents(p: { unallocated: number; credited: number; memberCredit: number }): number {
  return p.unallocated + Math.max(0, Math.min(p.credited, p.memberCredit));
}

/** What a payment row gives its DTO. */
const PAYMENT_ATTRIBUTES: (keyof InferAttributes<Payment>)[] = [
  'id',
  'method',
  'membershipId',
  'invoiceId',
  'amountCents',
  'appliedCents',
  'creditedCents',
  'unallocatedCents',
  'refundedCents',
  'receivedOn',
  'period',
  'reference',
  'note',
];
/** The payer's name and the invoice paid, joined to each payment in the same query. */
const PAYMENT_INCLUDE = [
  {
    model: Membership,
    as: 'membership',
    attributes: ['id'],
    required: true,
    include: [{ model: User, as: 'user', attributes: ['name'], required: true }],
  },
  { model: Invoice, as: 'invoice', attributes: ['id', 'number', 'kind', 'period'], required: false },
];
const PAYMENT_ORDER: [string, string][] = [
  ['receivedOn', 'DESC'],
  ['id', 'DESC'],
];

/**
 * Payments as the screens show them: with their refunds, whether their month is closed and the
 * payer's credit balance — three reads for the whole list (in parallel outside a transaction),
 * never one per payment.
 */
async function toPaymentDTOs(coopId: number, rows: Payment[], t?: Transaction): Promise<PaymentDTO[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((p) => p.id);
  const members = [...new Set(rows.map((p) => p.membershipId))];
  const periods = [...new Set(rows.map((p) => p.period))];
  const [refunds, credits, closed] = await readTogether(t, [
    () =>
      Refund.findAll({
        attributes: ['id', 'paymentId', 'amountCents', 'status', 'reason', 'refundedOn', 'failureMessage'],
        where: { coopId, paymentId: ids },
        order: [['id', 'ASC']],
        raw: true,
        transaction: t,
      }),
    () =>
      MemberCredit.findAll({
        attributes: ['membershipId', [fn('SUM', col('amount_cents')), 'balance']],
        where: { coopId, membershipId: members },
        group: ['membership_id'],
        raw: true,
        transaction: t,
      }) as unknown as Promise<{ membershipId: number; balance: string }[]>,
    () =>
      BillingPeriod.findAll({
        attributes: ['period'],
        where: { coopId, period: periods, status: 'closed' },
        raw: true,
        transaction: t,
      }),
  ]);
  const creditOf = new Map(credits.map((c) => [c.membershipId, cents(c.balance)]));
  const refundsOf = new Map<number, PaymentDTO['refunds']>();
  for (const r of refunds) {
    const list = refundsOf.get(r.paymentId) ?? [];
    list.push({
      id: r.id,
      amountCents: cents(r.amountCents),
      status: r.status,
      reason: r.reason,
      refundedOn: r.refundedOn,
      failureMessage: r.failureMessage,
    });
    refundsOf.set(r.paymentId, list);
  }
  const closedPeriods = new Set(closed.map((c) => c.period));
  return rows.map((p) => {
    const inv = p.invoice ?? null;
    const unallocated = cents(p.unallocatedCents);
    const credited = cents(p.creditedCents);
    return {
      id: p.id,
      method: p.method,
      memberId: p.membershipId,
      memberName: p.membership?.user?.name ?? '',
      invoiceId: p.invoiceId,
      invoiceLabel: inv ? invoiceLabel(inv.kind, inv.number) : null,
      invoicePeriod: inv ? dateToPeriod(inv.period) : null,
      amountCents: cents(p.amountCents),
      appliedCents: cents(p.appliedCents),
      creditedCents: credited,
      unallocatedCents: unallocated,
      refundedCents: cents(p.refundedCents),
      refundableCents: refundableCents({ unallocated, credited, memberCredit: creditOf.get(p.membershipId) ?? 0 }),
      receivedOn: p.receivedOn,
      period: dateToPeriod(p.period),
      reference: p.reference,
      note: p.note,
      periodClosed: closedPeriods.has(p.period),
      refunds: refundsOf.get(p.id) ?? [],
    };
  });
}

/** Payments of the co-op matching a condition on their attributes, newest first. */
export async function findPayments(coopId: number, where: PaymentWhere, t?: Transaction): Promise<PaymentDTO[]> {
  const rows = await Payment.findAll({
    attributes: PAYMENT_ATTRIBUTES,
    where: { [Op.and]: [{ coopId }, where] },
    include: PAYMENT_INCLUDE,
    order: PAYMENT_ORDER,
    transaction: t,
  });
  return toPaymentDTOs(coopId, rows, t);
}

/** The payments applied to (or matched with) one invoice of the co-op, newest first. */
export async function paymentsOfInvoice(coopId: number, invoiceId: number, t?: Transaction): Promise<PaymentDTO[]> {
  return findPayments(coopId, { invoiceId }, t);
}

/** One payment of the co-op (null when it is not theirs). */
export async function findPayment(coopId: number, id: number, t?: Transaction): Promise<PaymentDTO | null> {
  const [p] = await findPayments(coopId, { id }, t);
  return p ?? null;
}

/** Payments received in a month (or all), optionally only unmatched ones, paged. */
export async function listPayments(
  coopId: number,
  f: { period?: string; unmatched?: boolean; page: number; pageSize: number },
): Promise<Paged<PaymentDTO>> {
  const where: PaymentWhere = {
    coopId,
    ...(f.period ? { period: periodToDate(f.period) } : {}),
    ...(f.unmatched ? { unallocatedCents: { [Op.gt]: 0 } } : {}),
  };
  const [rows, total] = await Promise.all([
    Payment.findAll({
      attributes: PAYMENT_ATTRIBUTES,
      where,
      include: PAYMENT_INCLUDE,
      order: PAYMENT_ORDER,
      limit: f.pageSize,
      offset: (f.page - 1) * f.pageSize,
    }),
    Payment.count({ where }),
  ]);
  return { rows: await toPaymentDTOs(coopId, rows), total, page: f.page, pageSize: f.pageSize };
}

/**
 * Recomputes an invoice's paid amount and status from the payments applied to it (monotonic and
 * idempotent: the same payments always give the same result). Void invoices and credit notes are
 * left alone, and an invoice already right is not written (a closed month's row stays untouched).
 * Inside the caller's transaction, under the co-op's billing lock.
 */
export async function refreshInvoicePaid(t: Transaction, coopId: number, invoiceId: number): Promise<void> {
  const inv = await Invoice.findOne({
    attributes: ['id', 'kind', 'status', 'totalCents', 'paidCents'],
    where: { id: invoiceId, coopId },
    lock: t.LOCK.UPDATE,
    raw: true,
    transaction: t,
  });
  const paidSum = await Payment.sum('appliedCents', { where: { invoiceId, coopId }, transaction: t });
  if (
    !inv ||
    inv.kind !== 'invoice' ||
    !(inv.status === 'issued' || inv.status === 'partly-paid' || inv.status === 'paid')
  )
    return;
  const paid = paidSum ?? 0;
  const status = paid >= cents(inv.totalCents) ? 'paid' : paid > 0 ? 'partly-paid' : 'issued';
  if (cents(inv.paidCents) === paid && inv.status === status) return;
  await Invoice.update(
    { paidCents: String(paid), status },
    { where: { id: invoiceId, coopId, kind: 'invoice', status: ['issued', 'partly-paid', 'paid'] }, transaction: t },
  );
}
