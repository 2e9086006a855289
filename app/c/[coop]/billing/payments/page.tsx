import type { Metadata } from 'next';
import Link from 'next/link';
import { RecordPaymentForm } from '@/components/billing/payment-forms';
import { PaymentsTable } from '@/components/billing/payments-table';
import { Card } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { listInvoices, listMembersForBilling } from '@/lib/billing/invoices';
import { listPayments } from '@/lib/billing/payments-read';
import { periodLabel } from '@/lib/billing/periods';
import { todayIn } from '@/lib/dates';
import { paymentListQuerySchema } from '@/lib/validation/billing';

export const metadata: Metadata = { title: 'Payments' };

export default async function PaymentsPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'billing:manage');
  const parsed = paymentListQuerySchema.safeParse(await searchParams);
  const q = parsed.success ? parsed.data : paymentListQuerySchema.parse({});
  const [members, open, page] = await Promise.all([
    listMembersForBilling(actor.coop.id),
    listInvoices(actor.coop.id, { status: 'open', page: 1, pageSize: 200, sort: 'period', dir: 'desc' }),
    listPayments(actor.coop.id, {
      period: q.period,
      unmatched: Boolean(q.unmatched),
      page: q.page,
      pageSize: q.pageSize,
    }),
  ]);
  const openInvoices = open.rows.map((i) => ({
    id: i.id,
    memberId: i.memberId,
    label: `${i.label} (${periodLabel(i.period)})`,
    outstandingCents: i.outstandingCents,
  }));
  return (
    <div className="flex flex-col gap-6">
      <div>
        <Link href={`/c/${coop}/billing`} className="text-sm">
          ← Billing
        </Link>
        <h1 className="mt-1">Payments &amp; refunds</h1>
        <p className="text-stone-600">
          Card payments arrive by themselves. Record cash and cheques here; anything paid beyond an invoice is held as
          the member’s credit and taken off their next invoice.
        </p>
      </div>
      <Card title="Record a cash or cheque payment">
        <RecordPaymentForm
          coop={coop}
          members={members.map((m) => ({ id: m.id, name: m.name }))}
          invoices={openInvoices}
          currency={actor.coop.currency}
          today={todayIn(actor.coop.timezone)}
        />
      </Card>
      <section aria-labelledby="list-h" className="flex flex-col gap-2">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="list-h">{q.unmatched ? 'Unmatched payments' : 'All payments'}</h2>
          <Link
            className="text-sm"
            href={q.unmatched ? `/c/${coop}/billing/payments` : `/c/${coop}/billing/payments?unmatched=1`}
          >
            {q.unmatched ? 'Show all payments' : 'Show only unmatched'}
          </Link>
        </div>
        <PaymentsTable
          rows={page.rows}
          pageInfo={{ page: page.page, pageSize: page.pageSize, total: page.total }}
          coop={coop}
          currency={actor.coop.currency}
          timezone={actor.coop.timezone}
          openInvoices={openInvoices}
          caption="Payments received"
        />
      </section>
    </div>
  );
}
