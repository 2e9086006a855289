'use client';

import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features } from '@/components/data-table/data-table';
import { formatCents } from '@/lib/money/format';
import { periodLabel } from '@/lib/billing/periods';
import { PeriodStatusBadge } from './status-badge';

export interface MonthRow {
  period: string;
  closed: boolean;
  invoices: number;
  drafts: number;
  outstandingCents: number;
}
const col = createColumnHelper<Features, MonthRow>();

/** Billing months with their state, newest first. */
export function MonthsTable({ rows, coop, currency }: { rows: MonthRow[]; coop: string; currency: string }) {
  const columns: DataColumn<MonthRow>[] = [
    col.accessor('period', {
      meta: { priority: 'key' },
      id: 'period',
      header: 'Month',
      cell: (c) => (
        <Link className="font-semibold" href={`/c/${coop}/billing/${c.getValue()}`}>
          {periodLabel(c.getValue())}
        </Link>
      ),
    }),
    col.accessor('invoices', { id: 'invoices', header: 'Issued', cell: (c) => c.getValue() }),
    col.accessor('drafts', { id: 'drafts', header: 'Drafts', cell: (c) => c.getValue() }),
    col.accessor('outstandingCents', {
      meta: { priority: 'key' },
      id: 'outstanding',
      header: 'Outstanding',
      cell: (c) => <span className="tabular-nums">{formatCents(c.getValue(), currency)}</span>,
    }),
    col.accessor('closed', {
      meta: { priority: 'key' },
      id: 'state',
      header: 'State',
      cell: (c) => <PeriodStatusBadge closed={c.getValue()} />,
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Billing months"
      getRowId={(r) => r.period}
      empty="No month has been invoiced yet. Prepare the first one above."
    />
  );
}
