'use client';

import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import { formatCents } from '@/lib/money/format';
import { periodLabel } from '@/lib/billing/periods';
import type { InvoiceSummary } from '@/lib/billing/types';
import { EmailStatusText, InvoiceStatusBadge } from './status-badge';
import { formatDate } from '@/lib/dates';

const col = createColumnHelper<Features, InvoiceSummary>();

/**
 * Invoices as a table, sorted and paged on the server. `variant` 'treasurer' links to the
 * billing detail and shows member and e-mail columns; 'member' links to the member's own page.
 */
export function InvoicesTable({
  rows,
  pageInfo,
  coop,
  currency,
  timezone,
  variant,
  caption,
  empty,
}: {
  rows: InvoiceSummary[];
  pageInfo?: PageInfo;
  coop: string;
  currency: string;
  timezone: string;
  variant: 'treasurer' | 'member';
  caption: string;
  empty?: React.ReactNode;
}) {
  const money = (c: number) => formatCents(c, currency);
  const href = (id: number) =>
    variant === 'treasurer' ? `/c/${coop}/billing/invoices/${id}` : `/c/${coop}/invoices/${id}`;
  const columns: DataColumn<InvoiceSummary>[] = [
    col.accessor('number', {
      id: 'number',
      meta: { priority: 'key' },
      header: 'Number',
      cell: (c) => (
        <Link href={href(c.row.original.id)} className="font-semibold">
          {c.row.original.label ?? 'Draft'}
        </Link>
      ),
    }),
    ...(variant === 'treasurer'
      ? [col.accessor('memberName', { id: 'member', header: 'Member', cell: (c) => c.getValue() })]
      : [col.accessor('period', { id: 'period', header: 'Month', cell: (c) => periodLabel(c.getValue()) })]),
    col.accessor('totalCents', {
      meta: { priority: 'key' },
      id: 'total',
      header: 'Total',
      cell: (c) => <span className="tabular-nums">{money(c.getValue())}</span>,
    }),
    col.accessor('paidCents', {
      id: 'paid',
      header: 'Paid',
      cell: (c) => <span className="tabular-nums">{money(c.getValue())}</span>,
    }),
    col.accessor('outstandingCents', {
      meta: { priority: 'key' },
      id: 'outstanding',
      header: 'Due',
      cell: (c) => <span className="tabular-nums font-semibold">{money(c.getValue())}</span>,
    }),
    col.accessor('status', {
      meta: { priority: 'key' },
      id: 'status',
      header: 'Status',
      cell: (c) => (
        <InvoiceStatusBadge status={c.getValue()} kind={c.row.original.kind} overdue={c.row.original.overdue} />
      ),
    }),
    col.accessor('dueOn', {
      id: 'dueOn',
      header: 'Due by',
      cell: (c) => (c.getValue() && c.row.original.kind === 'invoice' ? formatDate(c.getValue()!, timezone) : '—'),
    }),
    ...(variant === 'treasurer'
      ? [
          col.accessor('emailStatus', {
            id: 'email',
            header: 'E-mail',
            cell: (c) => <EmailStatusText status={c.getValue()} />,
          }),
        ]
      : []),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption={caption}
      sortable={
        variant === 'treasurer'
          ? ['number', 'member', 'total', 'outstanding', 'status']
          : ['number', 'period', 'total', 'outstanding', 'status']
      }
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty={empty}
    />
  );
}
