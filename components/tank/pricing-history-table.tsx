'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features } from '@/components/data-table/data-table';
import { When } from '@/components/ui/when';
import { StatusBadge } from './status-badge';

export interface PolicyRowView {
  id: number;
  description: string;
  effectiveFrom: string;
  createdBy: string | null;
  status: 'in-force' | 'scheduled' | 'past';
}

const col = createColumnHelper<Features, PolicyRowView>();

/** Every pricing policy the co-op has had, newest first, the one in force marked. */
export function PricingHistoryTable({ rows, timeZone }: { rows: PolicyRowView[]; timeZone: string }) {
  const columns: DataColumn<PolicyRowView>[] = [
    col.accessor('effectiveFrom', {
      meta: { priority: 'key' },
      header: 'From',
      cell: (c) => <When value={c.getValue()} timeZone={timeZone} className="whitespace-nowrap" />,
    }),
    col.accessor('description', { meta: { priority: 'key' }, header: 'Policy', cell: (c) => c.getValue() }),
    col.accessor('status', {
      meta: { priority: 'key' },
      header: 'Status',
      cell: (c) => (
        <StatusBadge status={c.getValue()} label={c.getValue() === 'in-force' ? 'in force' : c.getValue()} />
      ),
    }),
    col.accessor('createdBy', { header: 'Set by', cell: (c) => c.getValue() ?? '—' }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Pricing history"
      getRowId={(r) => String(r.id)}
      empty="No price has been set yet."
    />
  );
}
