import type { Metadata } from 'next';
import { Fragment } from 'react';
import { formatDate } from '@/lib/dates';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { CloseMonthForm } from '@/components/billing/action-forms';
import { InvoicesTable } from '@/components/billing/invoices-table';
import { PaymentsTable } from '@/components/billing/payments-table';
import { PeriodProgress } from '@/components/billing/period-progress';
import { PeriodStatusBadge } from '@/components/billing/status-badge';
import { Card, Notice } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { listInvoices } from '@/lib/billing/invoices';
import { getPeriodOverview } from '@/lib/billing/months';
import { PERIOD_PATTERN, periodLabel } from '@/lib/billing/periods';
import { findPayments } from '@/lib/billing/payments-read';
import { getReconciliation } from '@/lib/billing/reconciliation';
import { formatCents } from '@/lib/money';
import { invoiceListQuerySchema } from '@/lib/validation/billing';

export async function generateMetadata({ params }: { params: Promise<{ period: string }> }): Promise<Metadata> {
  const { period } = await params;
  return { title: PERIOD_PATTERN.test(period) ? `Billing ${periodLabel(period)}` : 'Billing' };
}

export default async function BillingMonthPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string; period: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop, period } = await params;
  if (!PERIOD_PATTERN.test(period)) notFound();
  const actor = await requirePageActor(coop, 'billing:manage');
  const sp = invoiceListQuerySchema.safeParse({ sort: 'member', dir: 'asc', ...(await searchParams), period });
  const q = sp.success ? sp.data : invoiceListQuerySchema.parse({ period });
  const [overview, page, recon] = await Promise.all([
    getPeriodOverview(actor.coop.id, period),
    listInvoices(actor.coop.id, { ...q, includeDrafts: true }),
    getReconciliation(actor.coop.id, period),
  ]);
  const openInvoices = recon.payments.unmatched.length
    ? (
        await listInvoices(actor.coop.id, { status: 'open', page: 1, pageSize: 200, sort: 'period', dir: 'desc' })
      ).rows.map((i) => ({
        id: i.id,
        memberId: i.memberId,
        label: `${i.label} (${periodLabel(i.period)})`,
        outstandingCents: i.outstandingCents,
      }))
    : [];
  const money = (c: number) => formatCents(c, actor.coop.currency);
  const label = periodLabel(period);
  // What was paid on this month's invoices, by the month the money arrived (the sum is "Paid").
  const paidIds = recon.invoices.rows.filter((i) => i.paidCents > 0).map((i) => i.id);
  const paidByMonth = new Map<string, number>();
  for (const p of paidIds.length ? await findPayments(actor.coop.id, { invoiceId: paidIds }) : []) {
    if (p.appliedCents) paidByMonth.set(p.period, (paidByMonth.get(p.period) ?? 0) + p.appliedCents);
  }
  const paidMonths = [...paidByMonth].sort(([a], [b]) => a.localeCompare(b));
  const paidOtherMonths = paidMonths.some(([m]) => m !== period);
  const exportHref = (kind: string) => `/api/coops/${coop}/billing/periods/${period}/export?kind=${kind}`;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <Link href={`/c/${coop}/billing`} className="text-sm">
          ← Billing
        </Link>
        <h1 className="mt-1 flex flex-wrap items-center gap-3">
          {label} <PeriodStatusBadge closed={overview.closed} />
        </h1>
      </div>

      <PeriodProgress coop={coop} period={period} initial={overview} currency={actor.coop.currency} />

      <section aria-labelledby="invoices-h" className="flex flex-col gap-2">
        <h2 id="invoices-h">Invoices</h2>
        <InvoicesTable
          rows={page.rows}
          pageInfo={{ page: page.page, pageSize: page.pageSize, total: page.total }}
          coop={coop}
          currency={actor.coop.currency}
          timezone={actor.coop.timezone}
          variant="treasurer"
          caption={`Invoices for ${label}`}
          empty="No invoices for this month yet — prepare the drafts above."
        />
      </section>

      <section aria-labelledby="recon-h" className="flex flex-col gap-4">
        <h2 id="recon-h">Reconciliation</h2>
        <div className="grid gap-4 *:min-w-0 md:grid-cols-2">
          <Card title="Invoices of the month">
            <dl className="grid grid-cols-2 gap-y-1 text-sm">
              <dt>Invoiced ({recon.invoices.issuedCount})</dt>
              <dd className="text-right tabular-nums">{money(recon.invoices.invoicedCents)}</dd>
              <dt>Paid</dt>
              <dd className="text-right tabular-nums">{money(recon.invoices.paidCents)}</dd>
              {paidOtherMonths
                ? paidMonths.map(([m, c]) => (
                    <Fragment key={m}>
                      <dt className="pl-3 text-stone-600">with money received in {periodLabel(m)}</dt>
                      <dd className="text-right text-stone-600 tabular-nums">{money(c)}</dd>
                    </Fragment>
                  ))
                : null}
              <dt>Outstanding ({recon.invoices.unpaidCount} unpaid)</dt>
              <dd className="text-right font-semibold tabular-nums">{money(recon.invoices.outstandingCents)}</dd>
              {recon.invoices.creditNotesCents ? (
                <>
                  <dt>Credit notes</dt>
                  <dd className="text-right tabular-nums">{money(recon.invoices.creditNotesCents)}</dd>
                </>
              ) : null}
            </dl>
            {paidOtherMonths ? (
              <p className="mt-2 text-xs text-stone-700">
                “Paid” counts every payment on these invoices, whenever the money came; “Money received” beside it
                counts only the money that arrived in {label}. An invoice for {label} paid the month after shows as paid
                here and as received in that month.
              </p>
            ) : null}
          </Card>
          <Card title="Money received this month">
            <dl className="grid grid-cols-2 gap-y-1 text-sm">
              <dt>Received</dt>
              <dd className="text-right font-semibold tabular-nums">{money(recon.payments.receivedCents)}</dd>
              <dt className="pl-3 text-stone-600">by card</dt>
              <dd className="text-right text-stone-600 tabular-nums">{money(recon.payments.byMethod.card)}</dd>
              <dt className="pl-3 text-stone-600">in cash</dt>
              <dd className="text-right text-stone-600 tabular-nums">{money(recon.payments.byMethod.cash)}</dd>
              <dt className="pl-3 text-stone-600">by cheque</dt>
              <dd className="text-right text-stone-600 tabular-nums">{money(recon.payments.byMethod.cheque)}</dd>
              <dt>Applied to invoices</dt>
              <dd className="text-right tabular-nums">{money(recon.payments.appliedCents)}</dd>
              <dt className="pl-3 text-stone-600">of which to other months</dt>
              <dd className="text-right text-stone-600 tabular-nums">{money(recon.payments.appliedElsewhereCents)}</dd>
              <dt>Held as member credit</dt>
              <dd className="text-right tabular-nums">{money(recon.payments.creditedCents)}</dd>
              <dt>Not matched yet</dt>
              <dd className="text-right tabular-nums">{money(recon.payments.unallocatedCents)}</dd>
              <dt>Refunded</dt>
              <dd className="text-right tabular-nums">{money(recon.payments.refundedCents)}</dd>
            </dl>
          </Card>
        </div>
        <Card title="Checks">
          <ul className="flex flex-col gap-1 text-sm">
            {recon.checks.map((c) => (
              <li key={c.label} className={c.ok ? 'text-ok-700' : 'font-semibold text-danger-700'}>
                <span aria-hidden="true">{c.ok ? '✓' : '✗'}</span> {c.label}: {money(c.leftCents)} {c.ok ? '=' : '≠'}{' '}
                {money(c.rightCents)}
                <span className="sr-only">{c.ok ? ' (balances)' : ' (does not balance)'}</span>
              </li>
            ))}
          </ul>
          {recon.unbilledDraws.count ? (
            <p className="mt-2 text-sm text-stone-700">
              {recon.unbilledDraws.count} draw(s) of this month ({money(recon.unbilledDraws.totalCents)}) are not on an
              issued invoice yet; they go on the member’s next invoice.
            </p>
          ) : null}
          {recon.pendingCardAttempts ? (
            <p className="mt-2 text-sm text-warn-700">
              {recon.pendingCardAttempts} card payment(s) are still waiting for the payment service.
            </p>
          ) : null}
        </Card>
        {recon.payments.unmatched.length ? (
          <div className="flex flex-col gap-2">
            <h3 className="font-semibold text-fir-900">Payments not matched to an invoice</h3>
            <PaymentsTable
              rows={recon.payments.unmatched}
              coop={coop}
              currency={actor.coop.currency}
              timezone={actor.coop.timezone}
              openInvoices={openInvoices}
              caption="Unmatched payments"
            />
          </div>
        ) : (
          <p className="text-sm text-stone-700">Every payment received this month is matched.</p>
        )}
      </section>

      <Card title={overview.closed ? 'Month closed' : 'Close the month'}>
        {overview.closed ? (
          <p className="text-sm">
            Closed {recon.closedAt ? formatDate(recon.closedAt, actor.coop.timezone) : ''}
            {recon.closedBy ? ` by ${recon.closedBy}` : ''}. Its draws, invoices and payments are locked.
          </p>
        ) : recon.blockers.length ? (
          <Notice tone="warn" title={`${label} cannot be closed yet`}>
            <ul className="list-disc pl-5">
              {recon.blockers.map((b) => (
                <li key={b}>{b}</li>
              ))}
            </ul>
          </Notice>
        ) : (
          <CloseMonthForm coop={coop} period={period} label={label} />
        )}
      </Card>

      <Card title="Exports for the accountant">
        <ul className="flex flex-wrap gap-3 text-sm">
          <li>
            <a href={exportHref('invoices')} download>
              Invoices (CSV)
            </a>
          </li>
          <li>
            <a href={exportHref('payments')} download>
              Payments (CSV)
            </a>
          </li>
          <li>
            <a href={exportHref('balances')} download>
              Member balances (CSV)
            </a>
          </li>
        </ul>
      </Card>
    </div>
  );
}
