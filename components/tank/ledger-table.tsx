'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import { formatCents } from '@/lib/money';
import { When } from '@/components/ui/when';
import { formatMl } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';
import type { MovementDto } from '@/lib/tank/movements';

/** A ledger row as the page passes it (the lib DTO's fields the table shows). */
export type LedgerRow = Pick<
  MovementDto,
  | 'id'
  | 'kind'
  | 'quantityLiters'
  | 'valueCents'
  | 'onHandAfterLiters'
  | 'valueAfterCents'
  | 'reason'
  | 'batchId'
  | 'drawId'
  | 'memberName'
  | 'transferTankName'
  | 'byName'
  | 'occurredAt'
>;

const KIND_LABEL: Record<string, string> = {
  release: 'Batch released',
  draw: 'Draw',
  'draw-reversal': 'Draw reversed',
  'dip-adjustment': 'Dip adjustment',
  'transfer-in': 'Transfer in',
  'transfer-out': 'Transfer out',
  opening: 'Opening stock',
};

const col = createColumnHelper<Features, LedgerRow>();

/** The tank ledger: every movement with its signed quantity and value and the running totals after it. */
export function LedgerTable({
  rows,
  units,
  timeZone,
  currency,
  pageInfo,
}: {
  rows: LedgerRow[];
  units: UnitSystem;
  timeZone: string;
  currency: string;
  pageInfo: PageInfo;
}) {
  const money = (c: number) => formatCents(c, currency);
  const columns: DataColumn<LedgerRow>[] = [
    col.accessor('id', { id: 'recorded', header: '#', meta: { label: 'Order recorded' }, cell: (c) => c.getValue() }),
    col.accessor('occurredAt', {
      meta: { priority: 'key' },
      id: 'occurred_at',
      header: 'When',
      cell: (c) => <When value={c.getValue()} timeZone={timeZone} className="whitespace-nowrap" />,
    }),
    col.accessor('kind', {
      meta: { priority: 'key' },
      id: 'kind',
      header: 'Movement',
      cell: (c) => {
        const r = c.row.original;
        const detail = r.memberName
          ? r.memberName
          : r.transferTankName
            ? r.kind === 'transfer-in'
              ? `from ${r.transferTankName}`
              : `to ${r.transferTankName}`
            : r.batchId
              ? `batch #${r.batchId}`
              : null;
        return (
          <>
            <span className="font-medium">{KIND_LABEL[r.kind] ?? r.kind}</span>
            {detail ? (
              <span className="block text-xs text-stone-600">
                {detail}
                {r.drawId ? ` · draw #${r.drawId}` : ''}
              </span>
            ) : null}
            {r.reason ? <span className="block text-xs text-stone-600">{r.reason}</span> : null}
          </>
        );
      },
    }),
    col.accessor('quantityLiters', {
      meta: { priority: 'key' },
      id: 'quantity',
      header: 'Quantity',
      cell: (c) => (
        <span
          className={`tabular-nums whitespace-nowrap font-semibold ${c.getValue() < 0 ? 'text-danger-700' : 'text-ok-700'}`}
        >
          {formatMl(Math.round(c.getValue() * 1000), units, { signed: true })}
        </span>
      ),
    }),
    col.accessor('valueCents', {
      header: 'Value',
      cell: (c) => (
        <span className="tabular-nums whitespace-nowrap">
          {c.getValue() > 0 ? '+' : ''}
          {money(c.getValue())}
        </span>
      ),
    }),
    col.accessor('onHandAfterLiters', {
      header: 'On hand after',
      cell: (c) => (
        <span className="tabular-nums whitespace-nowrap">
          {formatMl(Math.round(c.getValue() * 1000), units)}
          <span className="block text-xs text-stone-600">{money(c.row.original.valueAfterCents)}</span>
        </span>
      ),
    }),
    col.accessor('byName', { header: 'By', cell: (c) => c.getValue() ?? '—' }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Tank ledger"
      sortable={['recorded', 'occurred_at', 'quantity', 'kind']}
      pageInfo={pageInfo}
      getRowId={(r) => r.id}
      empty="No movements yet."
    />
  );
}
