'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import { formatCents } from '@/lib/money';
import { When } from '@/components/ui/when';
import { formatMl } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';
import type { DrawDto } from '@/lib/tank/draws';
import { ReverseDrawButton } from './reverse-draw-button';
import { StatusBadge } from './status-badge';

/** A draw row as the pages pass it (the lib DTO's fields the table shows). */
export type DrawRow = Pick<
  DrawDto,
  | 'id'
  | 'tankName'
  | 'memberName'
  | 'quantityLiters'
  | 'declaredUse'
  | 'vehicle'
  | 'fuelCents'
  | 'surchargeCents'
  | 'taxCents'
  | 'totalCents'
  | 'occurredAt'
  | 'status'
  | 'reversesDrawId'
  | 'reversedByDrawId'
  | 'reason'
  | 'recordedBy'
  | 'batches'
>;

const col = createColumnHelper<Features, DrawRow>();

/** Draws with their locked amounts; brewers get a reverse action on draws not yet reversed. */
export function DrawsTable({
  rows,
  units,
  timeZone,
  currency,
  coopSlug,
  showMember,
  canReverse,
  pageInfo,
  sortable,
  caption = 'Draws',
}: {
  rows: DrawRow[];
  units: UnitSystem;
  timeZone: string;
  currency: string;
  coopSlug: string;
  showMember: boolean;
  canReverse: boolean;
  pageInfo?: PageInfo;
  sortable?: string[];
  caption?: string;
}) {
  const money = (c: number) => formatCents(c, currency);
  const columns: DataColumn<DrawRow>[] = [
    col.accessor('occurredAt', {
      meta: { priority: 'key' },
      id: 'occurred_at',
      header: 'When',
      cell: (c) => <When value={c.getValue()} timeZone={timeZone} className="whitespace-nowrap" />,
    }),
    col.accessor('id', { header: '#', meta: { label: 'Draw number' }, cell: (c) => c.getValue() }),
    ...(showMember
      ? [col.accessor('memberName', { meta: { priority: 'key' }, header: 'Member', cell: (c) => c.getValue() })]
      : []),
    col.accessor('tankName', { header: 'Tank', cell: (c) => c.getValue() }),
    col.accessor('quantityLiters', {
      id: 'quantity',
      header: 'Quantity',
      cell: (c) => (
        <span className="tabular-nums whitespace-nowrap">{formatMl(Math.round(c.getValue() * 1000), units)}</span>
      ),
    }),
    col.accessor('batches', {
      header: 'From batches',
      cell: (c) =>
        c.getValue().length ? (
          <ul className="text-xs">
            {c.getValue().map((b: DrawDto['batches'][number]) => (
              <li key={b.batchId ?? 'none'} className="whitespace-nowrap">
                {b.batchNumber !== null ? `Batch ${b.batchNumber}` : 'Unattributed'}: {formatMl(b.ml, units)}
              </li>
            ))}
          </ul>
        ) : (
          <span className="text-xs text-stone-600">Not recorded</span>
        ),
    }),
    col.accessor('declaredUse', {
      header: 'Use',
      cell: (c) => (
        <>
          {c.getValue()}
          {c.row.original.vehicle ? (
            <span className="block text-xs text-stone-600">{c.row.original.vehicle}</span>
          ) : null}
        </>
      ),
    }),
    col.accessor('totalCents', {
      id: 'total',
      meta: { priority: 'key' },
      header: 'Amount',
      cell: (c) => {
        const r = c.row.original;
        return (
          <span className="tabular-nums whitespace-nowrap">
            <strong>{money(r.totalCents)}</strong>
            <span className="block text-xs text-stone-600">
              fuel {money(r.fuelCents)}
              {r.surchargeCents ? ` · reserve ${money(r.surchargeCents)}` : ''}
              {r.taxCents ? ` · road tax ${money(r.taxCents)}` : ''}
            </span>
          </span>
        );
      },
    }),
    col.accessor('status', {
      meta: { priority: 'key' },
      header: 'Status',
      cell: (c) => {
        const r = c.row.original;
        return (
          <>
            <StatusBadge
              status={r.status}
              label={
                r.status === 'reversal'
                  ? `reverses #${r.reversesDrawId}`
                  : r.status === 'reversed'
                    ? `reversed by #${r.reversedByDrawId}`
                    : 'recorded'
              }
            />
            {r.reason ? <span className="block text-xs text-stone-600">{r.reason}</span> : null}
          </>
        );
      },
    }),
    ...(canReverse
      ? [
          col.display({
            id: 'actions',
            meta: { priority: 'key' },
            header: () => <span className="sr-only">Actions</span>,
            cell: (c) =>
              c.row.original.status === 'recorded' ? (
                <ReverseDrawButton
                  coopSlug={coopSlug}
                  drawId={c.row.original.id}
                  summary={`${formatMl(Math.round(c.row.original.quantityLiters * 1000), units)} for ${c.row.original.memberName}, ${money(c.row.original.totalCents)}`}
                />
              ) : null,
          }),
        ]
      : []),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption={caption}
      sortable={sortable}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty="No draws match."
    />
  );
}
