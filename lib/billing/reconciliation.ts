import 'server-only';
import {
  Op,
  type AggregateOptions,
  type FindOptions,
  type InferAttributes,
  type Model,
  type Transaction,
} from 'sequelize';
import type { z } from 'zod';
import type { reconciliationCheckSchema, reconciliationSchema } from '@/lib/api/dto/billing';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict } from '@/lib/http';
import { BillingPeriod, BillingRun, Coop, Invoice, InvoiceLine, Payment, PaymentAttempt, Refund, User } from '@/models';
import { listInvoices } from './invoices';
import { lockCoopBilling, periodBounds } from './locks';
import { findPayments, readTogether } from './payments-read';
import { currentPeriod, periodLabel, periodToDate, shiftPeriod } from './periods';
import { periodInvoiceTotals, periodPaymentTotals, unbilledDrawTotals } from './queries';

export type ReconciliationCheck = z.infer<typeof reconciliationCheckSchema>;

/** A month's books (the API's Reconciliation). */
export type Reconciliation = z.infer<typeof reconciliationSchema>;

/** Every invoice of a month on one page (a co-op bills a few hundred members). */
const ALL_ROWS = Number.MAX_SAFE_INTEGER;

/** `Model.sum` joins an `include` as findAll does, though its TypeScript options leave it out. */
type SumOptions<M extends Model> = AggregateOptions<unknown, InferAttributes<M>> &
  Pick<FindOptions<InferAttributes<M>>, 'include'>;

/** The reconciliation without its invoice rows: what closing a month decides on. */
type Books = Omit<Reconciliation, 'invoices'> & { invoices: Omit<Reconciliation['invoices'], 'rows'> };

/**
 * The month's totals, checks and blockers (read inside the caller's transaction when it has one:
 * closing reads them under the co-op's billing lock).
 */
async function readBooks(coopId: number, period: string, t?: Transaction): Promise<Books> {
  const periodDate = periodToDate(period);
  const nextPeriodDate = periodToDate(shiftPeriod(period, 1));
  // The lines of the month's issued invoices, and the payments applied to its invoices (any month's money).
  const issuedLinesOf: SumOptions<InvoiceLine> = {
    where: { coopId },
    include: [
      {
        model: Invoice,
        as: 'invoice',
        attributes: [],
        required: true,
        where: { period: periodDate, kind: 'invoice', status: { [Op.notIn]: ['draft', 'void'] } },
      },
    ],
    transaction: t,
  };
  const appliedToInvoicesOf: SumOptions<Payment> = {
    where: { coopId },
    include: [
      {
        model: Invoice,
        as: 'invoice',
        attributes: [],
        required: true,
        where: { period: periodDate, status: { [Op.ne]: 'void' } },
      },
    ],
    transaction: t,
  };
  const [inv, pay, linesCents, appliedToMonthCents, unmatched, pendingAttempts, pendingRefunds, coop, closed, running] =
    await readTogether(t, [
      () => periodInvoiceTotals(coopId, periodDate, t),
      () => periodPaymentTotals(coopId, periodDate, t),
      () => InvoiceLine.sum('amountCents', issuedLinesOf),
      () => Payment.sum('appliedCents', appliedToInvoicesOf),
      () => findPayments(coopId, { period: periodDate, unallocatedCents: { [Op.gt]: 0 } }, t),
      () =>
        PaymentAttempt.count({
          where: { coopId, status: 'pending' },
          include: [{ model: Invoice, as: 'invoice', attributes: [], required: true, where: { period: periodDate } }],
          transaction: t,
        }),
      // A pending refund holds the month it gives money back from, and the month it was made in.
      () =>
        Refund.count({
          where: {
            coopId,
            status: 'pending',
            [Op.or]: [
              { '$payment.period$': periodDate },
              { refundedOn: { [Op.gte]: periodDate, [Op.lt]: nextPeriodDate } },
            ],
          },
          include: [{ model: Payment, as: 'payment', attributes: [], required: true }],
          transaction: t,
        }),
      () => Coop.findByPk(coopId, { attributes: ['timezone'], raw: true, rejectOnEmpty: true, transaction: t }),
      () =>
        BillingPeriod.findOne({
          attributes: ['closedAt', 'closedByUserId'],
          where: { coopId, period: periodDate, status: 'closed' },
          raw: true,
          transaction: t,
        }),
      () => BillingRun.count({ where: { coopId, period: periodDate, status: 'running' }, transaction: t }),
    ]);
  const { start, end } = await periodBounds(periodDate, coop.timezone, t);
  const [unbilledDraws, closedBy] = await readTogether(t, [
    () => unbilledDrawTotals(coopId, start, end, t),
    async () =>
      closed?.closedByUserId
        ? User.findByPk(closed.closedByUserId, { attributes: ['name'], raw: true, transaction: t })
        : null,
  ]);

  const monthOver = period < currentPeriod(coop.timezone);
  const lines = linesCents ?? 0;
  const appliedToMonth = appliedToMonthCents ?? 0;
  const parts = pay.appliedCents + pay.creditedCents + pay.unallocatedCents + pay.refundedCents;
  const checks: ReconciliationCheck[] = [
    {
      label: 'Invoice totals equal the sum of their lines',
      leftCents: inv.invoicedCents,
      rightCents: lines,
      ok: inv.invoicedCents === lines,
    },
    {
      label: 'Amount invoiced = paid + outstanding',
      leftCents: inv.invoicedPositiveCents,
      rightCents: inv.paidCents + inv.outstandingCents,
      ok: inv.invoicedPositiveCents === inv.paidCents + inv.outstandingCents,
    },
    {
      label: 'Paid on these invoices = payments applied to them',
      leftCents: inv.paidCents,
      rightCents: appliedToMonth,
      ok: inv.paidCents === appliedToMonth,
    },
    {
      label: 'Money received = applied + held as credit + unmatched + refunded',
      leftCents: pay.receivedCents,
      rightCents: parts,
      ok: pay.receivedCents === parts,
    },
  ];
  const blockers: string[] = [];
  if (!monthOver) blockers.push(`${periodLabel(period)} is not over yet.`);
  if (running > 0) blockers.push('An invoicing run is still working on this month.');
  if (inv.drafts > 0) blockers.push(`${inv.drafts} draft invoice(s) are not issued yet.`);
  if (unmatched.length > 0)
    blockers.push(`${unmatched.length} payment(s) received this month are not matched to an invoice or to credit.`);
  if (pendingAttempts > 0)
    blockers.push(`${pendingAttempts} card payment(s) are still waiting for the payment service.`);
  if (pendingRefunds > 0) blockers.push(`${pendingRefunds} card refund(s) are still waiting for the payment service.`);
  if (checks.some((c) => !c.ok)) blockers.push('A reconciliation check does not balance.');

  return {
    period,
    closed: Boolean(closed),
    closedAt: closed?.closedAt ? new Date(closed.closedAt).toISOString() : null,
    closedBy: closedBy?.name ?? null,
    monthOver,
    invoices: {
      issuedCount: inv.issued,
      draftCount: inv.drafts,
      invoicedCents: inv.invoicedCents,
      creditNotesCents: inv.creditNotesCents,
      paidCents: inv.paidCents,
      outstandingCents: inv.outstandingCents,
      unpaidCount: inv.unpaid,
    },
    payments: {
      receivedCents: pay.receivedCents,
      byMethod: pay.byMethod,
      appliedCents: pay.appliedCents,
      creditedCents: pay.creditedCents,
      unallocatedCents: pay.unallocatedCents,
      refundedCents: pay.refundedCents,
      appliedElsewhereCents: pay.appliedElsewhereCents,
      unmatched,
    },
    pendingCardAttempts: pendingAttempts,
    pendingRefunds,
    unbilledDraws,
    checks,
    blockers: closed ? [] : blockers,
  };
}

/**
 * The month's books side by side: invoices with what is due, paid and outstanding; money
 * received that month and where it went; what is unmatched or still in flight; and identity
 * checks that must hold (each shows both sides so a difference is visible).
 */
export async function getReconciliation(coopId: number, period: string): Promise<Reconciliation> {
  const [books, invoices] = await Promise.all([
    readBooks(coopId, period),
    listInvoices(coopId, { period, page: 1, pageSize: ALL_ROWS, sort: 'number', dir: 'asc' }),
  ]);
  return { ...books, invoices: { rows: invoices.rows, ...books.invoices } };
}

/**
 * Closes a month: refused (409, with the reasons) until it is over, fully issued, every payment
 * received in it is matched, nothing is in flight with the payment service and every check
 * balances. From then on its draws, invoices and payments are locked (services and database
 * triggers) and corrections go into an open month as adjustments. Unpaid invoices stay payable.
 */
export async function closePeriod(actor: Actor, period: string): Promise<Reconciliation> {
  const coopId = actor.coop.id;
  const periodDate = periodToDate(period);
  await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const books = await readBooks(coopId, period, t);
    if (books.closed) throw conflict(`${periodLabel(period)} is already closed.`, { code: 'period-closed' });
    if (books.blockers.length)
      throw conflict(`${periodLabel(period)} cannot be closed yet.`, { blockers: books.blockers });
    const summary = {
      invoicedCents: books.invoices.invoicedCents,
      paidCents: books.invoices.paidCents,
      outstandingCents: books.invoices.outstandingCents,
      creditNotesCents: books.invoices.creditNotesCents,
      receivedCents: books.payments.receivedCents,
      refundedCents: books.payments.refundedCents,
      unbilledDraws: books.unbilledDraws.count,
    };
    // The month's row may exist already (open); under the billing lock, update it or create it.
    const closing = {
      status: 'closed' as const,
      closedAt: new Date(),
      closedByUserId: actor.user.id,
      summary: summary as BillingPeriod['summary'],
    };
    const [updated] = await BillingPeriod.update(closing, { where: { coopId, period: periodDate }, transaction: t });
    if (updated === 0) await BillingPeriod.create({ coopId, period: periodDate, ...closing }, { transaction: t });
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'billing.period.close',
        entityType: 'billing_period',
        entityId: period,
        before: { status: 'open' },
        after: { status: 'closed', ...summary },
      },
      t,
    );
  });
  return getReconciliation(coopId, period);
}
