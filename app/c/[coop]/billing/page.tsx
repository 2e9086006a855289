import type { Metadata } from 'next';
import Link from 'next/link';
import { AdjustmentForm } from '@/components/billing/action-forms';
import { MonthsTable } from '@/components/billing/months-table';
import { RunMonthForm } from '@/components/billing/run-month-form';
import { Card } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { listAdjustments } from '@/lib/billing/adjustments';
import { listMembersForBilling } from '@/lib/billing/invoices';
import { listPeriods } from '@/lib/billing/months';
import { currentPeriod, periodLabel, shiftPeriod } from '@/lib/billing/periods';
import { formatCents } from '@/lib/money';

export const metadata: Metadata = { title: 'Billing' };

export default async function BillingPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'billing:manage');
  const now = currentPeriod(actor.coop.timezone);
  const [months, members, adjustments] = await Promise.all([
    listPeriods(actor.coop.id),
    listMembersForBilling(actor.coop.id),
    listAdjustments(actor.coop.id, { pendingOnly: true }),
  ]);
  const dues = actor.coop.settings.monthlyDuesCents ?? 0;
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Billing</h1>
          <p className="text-stone-600">
            One invoice a month per member: their draws at the price locked when they drew,{' '}
            {dues ? `dues of ${formatCents(dues, actor.coop.currency)}` : 'no dues (set them in the co-op settings)'},
            surcharge and road-fuel tax, adjustments, and any credit they hold.
          </p>
        </div>
        <Link
          href={`/c/${coop}/billing/payments`}
          className="rounded-lg border border-stone-300 bg-white px-4 py-2.5 text-sm font-semibold no-underline hover:bg-stone-100"
        >
          Payments &amp; refunds
        </Link>
      </div>
      <Card title="Prepare a month">
        <p className="mb-3 text-sm text-stone-700">
          Drafts are built in the background; you can watch the progress, check them, and issue them when they look
          right. Preparing a month again is always safe.
        </p>
        <RunMonthForm coop={coop} defaultPeriod={shiftPeriod(now, -1)} maxPeriod={now} />
      </Card>
      <section aria-labelledby="months-h" className="flex flex-col gap-2">
        <h2 id="months-h">Months</h2>
        <MonthsTable rows={months} coop={coop} currency={actor.coop.currency} />
      </section>
      <Card title="Adjustments for the next invoice">
        <p className="mb-3 text-sm text-stone-700">
          Use an adjustment for anything the monthly run cannot know — a refund of an overcharge, a replacement key, a
          correction to a month that is already closed ({periodLabel(now)} is the current month).
        </p>
        {adjustments.length ? (
          <ul className="mb-4 divide-y divide-stone-100 rounded-lg border border-stone-200">
            {adjustments.map((a) => (
              <li key={a.id} className="flex flex-wrap justify-between gap-2 px-3 py-2 text-sm">
                <span>
                  <strong>{a.memberName}</strong> — {a.description}{' '}
                  <span className="text-stone-600">(from {periodLabel(a.period)})</span>
                </span>
                <span className="tabular-nums font-semibold">{formatCents(a.amountCents, actor.coop.currency)}</span>
              </li>
            ))}
          </ul>
        ) : (
          <p className="mb-4 text-sm text-stone-600">No adjustments are waiting.</p>
        )}
        <AdjustmentForm
          coop={coop}
          members={members.map((m) => ({ id: m.id, name: m.name }))}
          currency={actor.coop.currency}
          currentPeriod={now}
        />
      </Card>
    </div>
  );
}
