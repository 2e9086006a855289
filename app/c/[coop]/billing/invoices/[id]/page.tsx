import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { VoidInvoiceForm } from '@/components/billing/action-forms';
import { RecordPaymentForm } from '@/components/billing/payment-forms';
import { InvoiceEmailDelivery } from '@/components/billing/email-delivery';
import { InvoiceSummaryView } from '@/components/billing/invoice-summary';
import { PaymentConfirmingNotice } from '@/components/billing/payment-confirming';
import { PaymentsTable } from '@/components/billing/payments-table';
import { Card, Notice } from '@/components/ui/notice';
import { requirePageActor } from '@/lib/auth';
import { whyNoDues } from '@/lib/billing/dues-note';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { todayIn } from '@/lib/dates';
import { HttpError } from '@/lib/http';

export const metadata: Metadata = { title: 'Invoice' };

export default async function BillingInvoicePage({ params }: { params: Promise<{ coop: string; id: string }> }) {
  const { coop, id } = await params;
  const actor = await requirePageActor(coop, 'billing:manage');
  if (!/^[1-9]\d{0,9}$/.test(id)) notFound();
  const inv = await getInvoiceDetail(actor.coop.id, Number(id), { includeDrafts: true }).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const duesNote = await whyNoDues(actor.coop, inv, 'treasurer');
  const canVoid =
    inv.kind === 'invoice' &&
    ['issued', 'partly-paid', 'paid'].includes(inv.status) &&
    !inv.periodClosed &&
    !inv.pendingAttempt;
  return (
    <div className="flex flex-col gap-6">
      <Link href={`/c/${coop}/billing/${inv.period}`} className="text-sm">
        ← Billing month
      </Link>
      <InvoiceSummaryView inv={inv} coop={actor.coop} duesNote={duesNote} />
      {inv.original ? (
        <p className="text-sm">
          Cancels <Link href={`/c/${coop}/billing/invoices/${inv.original.id}`}>{inv.original.label}</Link>.
        </p>
      ) : null}
      {inv.creditNote ? (
        <p className="text-sm">
          Cancelled by <Link href={`/c/${coop}/billing/invoices/${inv.creditNote.id}`}>{inv.creditNote.label}</Link>.
        </p>
      ) : null}
      {inv.periodClosed ? (
        <Notice title="This month is closed">
          This invoice can no longer be changed or voided. Correct it with an adjustment on the member’s next invoice.
        </Notice>
      ) : null}
      {inv.pendingAttempt ? (
        <PaymentConfirmingNotice
          startedAt={inv.pendingAttempt.createdAt}
          timezone={actor.coop.timezone}
          audience="treasurer"
        />
      ) : null}

      <div className="grid gap-4 *:min-w-0 lg:grid-cols-2">
        <Card title="Document">
          <div className="flex flex-col gap-3 text-sm">
            <a className="font-semibold" href={`/api/coops/${coop}/billing/invoices/${inv.id}/pdf`}>
              Download PDF
            </a>
            {inv.status !== 'draft' ? (
              <>
                <InvoiceEmailDelivery
                  coop={coop}
                  invoiceId={inv.id}
                  to={inv.memberEmail}
                  timezone={actor.coop.timezone}
                  initial={{ emailStatus: inv.emailStatus, emailedAt: inv.emailedAt, emailAttempts: inv.emailAttempts }}
                />
              </>
            ) : (
              <p className="text-stone-600">Drafts are not e-mailed. Issue the month’s drafts from the month page.</p>
            )}
          </div>
        </Card>
        {canVoid ? (
          <Card title="Void this invoice">
            <VoidInvoiceForm coop={coop} invoiceId={inv.id} label={inv.label ?? 'this invoice'} />
          </Card>
        ) : null}
      </div>

      {inv.kind === 'invoice' && (inv.status === 'issued' || inv.status === 'partly-paid') ? (
        <Card title="Record a cash or cheque payment">
          <RecordPaymentForm
            coop={coop}
            members={[]}
            invoices={[]}
            currency={actor.coop.currency}
            today={todayIn(actor.coop.timezone)}
            fixed={{ memberId: inv.memberId, invoiceId: inv.id }}
          />
        </Card>
      ) : null}

      <section aria-labelledby="payments-h" className="flex flex-col gap-2">
        <h2 id="payments-h">Payments</h2>
        <PaymentsTable
          rows={inv.payments}
          coop={coop}
          currency={actor.coop.currency}
          timezone={actor.coop.timezone}
          openInvoices={[]}
          caption="Payments on this invoice"
        />
      </section>
    </div>
  );
}
