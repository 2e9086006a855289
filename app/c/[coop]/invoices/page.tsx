import type { Metadata } from 'next';
import { InvoicesTable } from '@/components/billing/invoices-table';
import { Card } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { listInvoices, memberBalance } from '@/lib/billing/invoices';
import { formatCents } from '@/lib/money';
import { invoiceListQuerySchema } from '@/lib/validation/billing';

export const metadata: Metadata = { title: 'My invoices' };

export default async function MyInvoicesPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'invoices:own');
  const parsed = invoiceListQuerySchema.safeParse({ sort: 'period', ...(await searchParams) });
  const q = parsed.success ? parsed.data : invoiceListQuerySchema.parse({ sort: 'period' });
  const [page, balance] = await Promise.all([
    listInvoices(actor.coop.id, { ...q, membershipId: actor.membershipId, includeDrafts: false }),
    memberBalance(actor.coop.id, actor.membershipId),
  ]);
  const money = (c: number) => formatCents(c, actor.coop.currency);
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1>My invoices</h1>
        <p className="text-stone-600">
          Your monthly invoices from {actor.coop.name}. Open one to download it or pay it by card.
        </p>
      </div>
      <Card title="My balance">
        <dl className="grid grid-cols-1 gap-4 sm:grid-cols-3">
          <div>
            <dt className="text-sm text-stone-600">Owed on invoices</dt>
            <dd className="text-2xl font-bold tabular-nums">{money(balance.outstandingCents)}</dd>
          </div>
          <div>
            <dt className="text-sm text-stone-600">Credit on my account</dt>
            <dd className="text-2xl font-bold tabular-nums text-ok-700">{money(balance.creditCents)}</dd>
            <dd className="text-xs text-stone-600">Taken off your next invoice.</dd>
          </div>
          {balance.unallocatedCents ? (
            <div>
              <dt className="text-sm text-stone-600">Received, being matched</dt>
              <dd className="text-2xl font-bold tabular-nums">{money(balance.unallocatedCents)}</dd>
            </div>
          ) : null}
        </dl>
      </Card>
      <InvoicesTable
        rows={page.rows}
        pageInfo={{ page: page.page, pageSize: page.pageSize, total: page.total }}
        coop={coop}
        currency={actor.coop.currency}
        timezone={actor.coop.timezone}
        variant="member"
        caption="My invoices"
        empty="No invoices yet. They arrive by e-mail at the start of each month."
      />
    </div>
  );
}
