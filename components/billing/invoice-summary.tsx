import { formatCents, INVOICE_ROUNDING_NOTE } from '@/lib/money';
import { periodLabel } from '@/lib/billing/periods';
import type { InvoiceDetail } from '@/lib/billing/types';
import { InvoiceLinesTable } from './invoice-lines-table';
import { PaymentConfirmingBadge } from './payment-confirming';
import { InvoiceStatusBadge } from './status-badge';
import type { UnitSystem } from '@/lib/units';
import { formatDate } from '@/lib/dates';

/** The invoice itself, as both the treasurer and the member see it: header, lines, totals. */
export function InvoiceSummaryView({
  inv,
  coop,
  duesNote,
}: {
  inv: InvoiceDetail;
  coop: { units: UnitSystem; currency: string; timezone: string };
  duesNote?: string | null;
}) {
  const money = (c: number) => formatCents(c, coop.currency);
  const isCredit = inv.kind === 'credit-note';
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1>
          {isCredit ? 'Credit note' : 'Invoice'} {inv.label ?? '(draft)'}
        </h1>
        <InvoiceStatusBadge status={inv.status} kind={inv.kind} overdue={inv.overdue} />
        {inv.pendingAttempt && (inv.status === 'issued' || inv.status === 'partly-paid') ? (
          <PaymentConfirmingBadge />
        ) : null}
      </div>
      <dl className="grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-2 lg:grid-cols-4">
        <div>
          <dt className="text-stone-600">Member</dt>
          <dd className="font-medium">{inv.memberName}</dd>
        </div>
        <div>
          <dt className="text-stone-600">Month</dt>
          <dd className="font-medium">{periodLabel(inv.period)}</dd>
        </div>
        <div>
          <dt className="text-stone-600">Issued</dt>
          <dd className="font-medium">{inv.issuedAt ? formatDate(inv.issuedAt, coop.timezone) : 'Not yet'}</dd>
        </div>
        {!isCredit ? (
          <div>
            <dt className="text-stone-600">Due by</dt>
            <dd className="font-medium">{inv.dueOn ? formatDate(inv.dueOn, coop.timezone) : '—'}</dd>
          </div>
        ) : null}
      </dl>
      {inv.status === 'void' ? (
        <p className="rounded-lg bg-stone-100 p-3 text-sm">
          Voided{inv.voidedAt ? ` on ${formatDate(inv.voidedAt, coop.timezone)}` : ''}: {inv.voidReason}
          {inv.creditNote ? ` — see credit note ${inv.creditNote.label}.` : ''}
        </p>
      ) : null}
      <InvoiceLinesTable lines={inv.lines} units={coop.units} currency={coop.currency} timezone={coop.timezone} />
      {duesNote ? <p className="text-sm text-stone-700">{duesNote}</p> : null}
      <dl className="ml-auto grid w-full max-w-xs grid-cols-2 gap-y-1 text-sm">
        <dt className="font-semibold">{isCredit ? 'Total credited' : 'Total'}</dt>
        <dd className="text-right font-semibold tabular-nums">{money(inv.totalCents)}</dd>
        {!isCredit && inv.status !== 'draft' ? (
          <>
            <dt>Paid</dt>
            <dd className="text-right tabular-nums">{money(inv.paidCents)}</dd>
            {inv.status !== 'void' ? (
              <>
                <dt className="font-semibold">Amount due</dt>
                <dd className="text-right text-lg font-bold tabular-nums">{money(inv.outstandingCents)}</dd>
              </>
            ) : null}
          </>
        ) : null}
      </dl>
      <p className="text-xs text-stone-600">{INVOICE_ROUNDING_NOTE}</p>
    </div>
  );
}
