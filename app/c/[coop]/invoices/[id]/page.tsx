import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { InvoiceSummaryView } from '@/components/billing/invoice-summary';
import { PayInvoiceForm } from '@/components/billing/pay-invoice-form';
import { PaymentConfirmingNotice } from '@/components/billing/payment-confirming';
import { Card } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { MIN_CARD_CHARGE_CENTS } from '@/lib/billing/card';
import { whyNoDues } from '@/lib/billing/dues-note';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { METHOD_LABEL } from '@/lib/billing/status';
import { HttpError } from '@/lib/http';
import { formatCents } from '@/lib/money';
import { formatDate } from '@/lib/dates';

export const metadata: Metadata = { title: 'Invoice' };

export default async function MyInvoicePage({ params }: { params: Promise<{ coop: string; id: string }> }) {
  const { coop, id } = await params;
  const actor = await requirePageActor(coop, 'invoices:own');
  if (!/^[1-9]\d{0,9}$/.test(id)) notFound();
  const inv = await getInvoiceDetail(actor.coop.id, Number(id), {
    membershipId: actor.membershipId,
    includeDrafts: false,
  }).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const duesNote = await whyNoDues(actor.coop, inv, 'member');
  const money = (c: number) => formatCents(c, actor.coop.currency);
  const payable = inv.kind === 'invoice' && (inv.status === 'issued' || inv.status === 'partly-paid');
  return (
    <div className="flex flex-col gap-6">
      <Link href={`/c/${coop}/invoices`} className="text-sm">
        ← My invoices
      </Link>
      <InvoiceSummaryView inv={inv} coop={actor.coop} duesNote={duesNote} />
      <div className="grid gap-4 *:min-w-0 lg:grid-cols-2">
        <Card title={payable ? 'Pay this invoice' : inv.status === 'paid' ? 'Paid' : 'Payment'}>
          {payable && inv.pendingAttempt ? (
            <PaymentConfirmingNotice
              startedAt={inv.pendingAttempt.createdAt}
              timezone={actor.coop.timezone}
              audience="member"
            />
          ) : null}
          {payable && inv.outstandingCents >= MIN_CARD_CHARGE_CENTS ? (
            <PayInvoiceForm
              coop={coop}
              invoiceId={inv.id}
              amountCents={inv.outstandingCents}
              currency={actor.coop.currency}
            />
          ) : payable ? (
            <p className="text-sm">
              The {money(inv.outstandingCents)} left is too small to pay by card; please pay the treasurer in cash.
            </p>
          ) : inv.status === 'paid' ? (
            <p className="text-sm text-ok-700">This invoice is paid in full. Thank you!</p>
          ) : inv.kind === 'credit-note' ? (
            <p className="text-sm">
              This credit note cancels {inv.original?.label ?? 'an invoice'}; anything you paid on it is credit on your
              account.
            </p>
          ) : (
            <p className="text-sm">This invoice was voided and needs no payment.</p>
          )}
          {payable ? (
            <p className="mt-3 text-sm text-stone-700">
              You can also pay the treasurer in cash or by cheque, writing {inv.label} on it.
            </p>
          ) : null}
        </Card>
        <Card title="Download">
          <a className="font-semibold" href={`/api/coops/${coop}/invoices/${inv.id}/pdf`}>
            Download {inv.label} (PDF)
          </a>
          {inv.payments.length ? (
            <>
              <h3 className="mt-4 font-semibold text-fir-900">Payments received</h3>
              <ul className="mt-1 text-sm">
                {inv.payments.map((p) => (
                  <li key={p.id}>
                    {formatDate(p.receivedOn, actor.coop.timezone)} — {METHOD_LABEL[p.method]} {money(p.amountCents)}
                    {p.creditedCents ? ` (${money(p.creditedCents)} kept as credit)` : ''}
                  </li>
                ))}
              </ul>
            </>
          ) : null}
        </Card>
      </div>
    </div>
  );
}
