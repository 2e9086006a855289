'use client';

import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import { formatCents } from '@/lib/money/format';
import { METHOD_LABEL } from '@/lib/billing/status';
import type { PaymentDTO } from '@/lib/billing/types';
import { MatchPaymentForm, RefundForm, RetryRefundButton, type OpenInvoiceOption } from './payment-forms';
import { formatDate } from '@/lib/dates';

const col = createColumnHelper<Features, PaymentDTO>();

/** Payments received, with where each went, and refund / match actions per row. */
export function PaymentsTable({
  rows,
  pageInfo,
  coop,
  currency,
  timezone,
  openInvoices,
  caption,
}: {
  rows: PaymentDTO[];
  pageInfo?: PageInfo;
  coop: string;
  currency: string;
  timezone: string;
  openInvoices: OpenInvoiceOption[];
  caption: string;
}) {
  const money = (c: number) => formatCents(c, currency);
  const columns: DataColumn<PaymentDTO>[] = [
    col.accessor('receivedOn', {
      meta: { priority: 'key' },
      id: 'received',
      header: 'Received',
      cell: (c) => formatDate(c.getValue(), timezone),
    }),
    col.accessor('memberName', {
      meta: { priority: 'key' },
      id: 'member',
      header: 'Member',
      cell: (c) => c.getValue(),
    }),
    col.accessor('method', {
      id: 'method',
      header: 'Method',
      cell: (c) => (
        <>
          {METHOD_LABEL[c.getValue()]}
          {c.row.original.reference ? (
            <span className="block text-xs text-stone-600">{c.row.original.reference}</span>
          ) : null}
        </>
      ),
    }),
    col.accessor('amountCents', {
      meta: { priority: 'key' },
      id: 'amount',
      header: 'Amount',
      cell: (c) => <span className="tabular-nums font-semibold">{money(c.getValue())}</span>,
    }),
    col.display({
      id: 'where',
      header: 'Went to',
      cell: (c) => {
        const p = c.row.original;
        return (
          <ul className="text-xs">
            {p.appliedCents ? (
              <li>
                {money(p.appliedCents)} on{' '}
                {p.invoiceId ? (
                  <Link href={`/c/${coop}/billing/invoices/${p.invoiceId}`}>{p.invoiceLabel}</Link>
                ) : (
                  'an invoice'
                )}
              </li>
            ) : null}
            {p.creditedCents ? <li>{money(p.creditedCents)} held as credit</li> : null}
            {p.unallocatedCents ? (
              <li className="font-semibold text-warn-700">{money(p.unallocatedCents)} not matched</li>
            ) : null}
            {p.refunds.map((r) => (
              <li key={r.id}>
                {money(r.amountCents)} refunded{r.status !== 'succeeded' ? ` (${r.status})` : ''}
                {r.status === 'pending' && p.method === 'card' ? (
                  <RetryRefundButton coop={coop} refundId={r.id} />
                ) : null}
              </li>
            ))}
          </ul>
        );
      },
    }),
    col.display({
      id: 'actions',
      meta: { priority: 'key' },
      header: 'Actions',
      cell: (c) => {
        const p = c.row.original;
        if (p.periodClosed && p.refundableCents === 0)
          return <span className="text-xs text-stone-600">Month closed</span>;
        return (
          <div className="flex min-w-52 flex-col gap-2">
            {p.unallocatedCents > 0 && !p.periodClosed ? (
              <MatchPaymentForm
                coop={coop}
                paymentId={p.id}
                invoices={openInvoices.filter((i) => i.memberId === p.memberId)}
                currency={currency}
              />
            ) : null}
            {p.refundableCents > 0 ? (
              <div>
                <RefundForm
                  coop={coop}
                  paymentId={p.id}
                  refundableCents={p.refundableCents}
                  method={p.method}
                  currency={currency}
                  payer={p.memberName ?? undefined}
                />
              </div>
            ) : null}
          </div>
        );
      },
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption={caption}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty="No payments recorded yet."
    />
  );
}
