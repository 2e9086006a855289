import 'server-only';
import type { z } from 'zod';
import { col, fn, literal } from 'sequelize';
import type { periodOverviewSchema } from '@/lib/api/dto/billing';
import { BillingPeriod, BillingRun, Invoice } from '@/models';
import { cents } from './cents';
import { OPEN_STATUSES, outstandingSql } from './status';
import { periodToDate } from './periods';
import { latestRun } from './run';
import type { EmailStatus, InvoiceStatus } from './types';

// Billing months as the treasurer sees them: the list of months and one month's progress, each a
// grouped read of its invoices.

/** What the month page polls: run progress, counts by status and e-mail state. */
export type PeriodOverview = z.infer<typeof periodOverviewSchema>;

/** A month's invoices counted and summed by kind, status and e-mail state (one grouped read). */
interface InvoiceGroup {
  kind: Invoice['kind'];
  status: InvoiceStatus;
  emailStatus: EmailStatus;
  n: string;
  total: string | null;
  paid: string | null;
  outstanding: string | null;
}

export async function getPeriodOverview(coopId: number, period: string): Promise<PeriodOverview> {
  const periodDate = periodToDate(period);
  const [groups, closed, run] = await Promise.all([
    Invoice.findAll({
      attributes: [
        'kind',
        'status',
        'emailStatus',
        [fn('count', col('id')), 'n'],
        [fn('SUM', col('total_cents')), 'total'],
        [fn('SUM', col('paid_cents')), 'paid'],
        [fn('SUM', literal(outstandingSql())), 'outstanding'],
      ],
      where: { coopId, period: periodDate },
      group: ['kind', 'status', 'emailStatus'],
      raw: true,
    }) as unknown as Promise<InvoiceGroup[]>,
    BillingPeriod.findOne({
      where: { coopId, period: periodDate, status: 'closed' },
      attributes: ['closedAt'],
      raw: true,
    }),
    latestRun(coopId, periodDate),
  ]);
  const counts = { draft: 0, issued: 0, partlyPaid: 0, paid: 0, void: 0, creditNotes: 0 };
  const email = { queued: 0, sending: 0, sent: 0, failed: 0, notSent: 0 };
  const totals = { invoicedCents: 0, paidCents: 0, outstandingCents: 0, draftCents: 0 };
  for (const g of groups) {
    const n = cents(g.n);
    if (g.kind === 'credit-note') counts.creditNotes += n;
    else if (g.status === 'partly-paid') counts.partlyPaid += n;
    else counts[g.status] += n;
    if (g.emailStatus === 'not-sent') {
      if (g.status !== 'draft') email.notSent += n;
    } else email[g.emailStatus] += n;
    if (g.kind !== 'invoice') continue;
    if (g.status === 'draft') totals.draftCents += cents(g.total);
    else if (g.status !== 'void') {
      totals.invoicedCents += cents(g.total);
      totals.paidCents += cents(g.paid);
      if (OPEN_STATUSES.includes(g.status)) totals.outstandingCents += cents(g.outstanding);
    }
  }
  return {
    period,
    closed: Boolean(closed),
    closedAt: closed?.closedAt ? new Date(closed.closedAt).toISOString() : null,
    run,
    counts,
    email,
    totals,
  };
}

/** Months that have invoices, runs or a close, newest first (the billing overview). */
export async function listPeriods(
  coopId: number,
): Promise<{ period: string; closed: boolean; invoices: number; drafts: number; outstandingCents: number }[]> {
  const [groups, runs, periods] = await Promise.all([
    Invoice.findAll({
      attributes: [
        'period',
        'kind',
        'status',
        [fn('count', col('id')), 'n'],
        [fn('SUM', literal(outstandingSql())), 'outstanding'],
      ],
      where: { coopId },
      group: ['period', 'kind', 'status'],
      raw: true,
    }) as unknown as Promise<(Pick<InvoiceGroup, 'kind' | 'status' | 'n' | 'outstanding'> & { period: string })[]>,
    BillingRun.findAll({ attributes: ['period'], where: { coopId }, group: ['period'], raw: true }),
    BillingPeriod.findAll({ attributes: ['period', 'status'], where: { coopId }, raw: true }),
  ]);
  const months = new Map<
    string,
    { period: string; closed: boolean; invoices: number; drafts: number; outstandingCents: number }
  >();
  const month = (date: string) => {
    const period = String(date).slice(0, 7);
    let m = months.get(period);
    if (!m) months.set(period, (m = { period, closed: false, invoices: 0, drafts: 0, outstandingCents: 0 }));
    return m;
  };
  for (const g of groups) {
    const m = month(g.period);
    const n = cents(g.n);
    if (g.status === 'draft') m.drafts += n;
    else if (g.kind === 'invoice' && g.status !== 'void') m.invoices += n;
    if (g.kind === 'invoice' && OPEN_STATUSES.includes(g.status)) m.outstandingCents += cents(g.outstanding);
  }
  for (const r of runs) month(r.period);
  for (const p of periods) month(p.period).closed ||= p.status === 'closed';
  return [...months.values()].sort((a, b) => b.period.localeCompare(a.period)).slice(0, 36);
}
