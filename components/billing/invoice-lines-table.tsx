'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features } from '@/components/data-table/data-table';
import { formatCents, formatRateCents } from '@/lib/money/format';
import type { InvoiceLineDTO } from '@/lib/billing/types';
import { formatVolume, perGallonToPerLiter, type UnitSystem } from '@/lib/units';
import { formatDate } from '@/lib/dates';

const col = createColumnHelper<Features, InvoiceLineDTO>();

/** An invoice's lines: quantities in the co-op's units, rates per gallon or per litre. */
export function InvoiceLinesTable({
  lines,
  units,
  currency,
  timezone,
}: {
  lines: InvoiceLineDTO[];
  units: UnitSystem;
  currency: string;
  timezone: string;
}) {
  const columns: DataColumn<InvoiceLineDTO>[] = [
    col.accessor('occurredAt', {
      id: 'date',
      header: 'Date',
      cell: (c) => (c.getValue() ? formatDate(c.getValue()!, timezone) : ''),
    }),
    col.accessor('description', {
      meta: { priority: 'key' },
      id: 'description',
      header: 'Description',
      cell: (c) => c.getValue(),
    }),
    col.accessor('quantityLiters', {
      id: 'quantity',
      header: 'Quantity',
      cell: (c) =>
        c.getValue() === null ? '' : <span className="tabular-nums">{formatVolume(c.getValue()!, units, 2)}</span>,
    }),
    col.accessor('unitPriceCentsPerGallon', {
      id: 'rate',
      header: 'Rate',
      cell: (c) => {
        const v = c.getValue();
        if (v === null) return '';
        return `${formatRateCents(units === 'us' ? v : perGallonToPerLiter(v), currency)}/${units === 'us' ? 'gal' : 'L'}`;
      },
    }),
    col.accessor('amountCents', {
      meta: { priority: 'key' },
      id: 'amount',
      header: 'Amount',
      cell: (c) => <span className="tabular-nums">{formatCents(c.getValue(), currency)}</span>,
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={lines}
      caption="Invoice lines"
      getRowId={(r) => r.id}
      empty="This invoice has no lines."
    />
  );
}
