'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import { formatWhen } from '@/lib/dates';
import { formatMl } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';
import type { ReservationDto } from '@/lib/tank/reservations';
import { CancelReservationButton } from './cancel-reservation-button';
import { StatusBadge } from './status-badge';

/** A reservation row as the pages pass it (the lib DTO's fields the table shows). */
export type ReservationRow = Pick<
  ReservationDto,
  'id' | 'tankName' | 'memberName' | 'quantityLiters' | 'windowStart' | 'windowEnd' | 'status' | 'drawId'
> & { canCancel: boolean };

const col = createColumnHelper<Features, ReservationRow>();

/** Reservations, sorted and paged on the server; open ones can be cancelled where allowed. */
export function ReservationsTable({
  rows,
  units,
  timeZone,
  coopSlug,
  showMember,
  pageInfo,
  sortable,
}: {
  rows: ReservationRow[];
  units: UnitSystem;
  timeZone: string;
  coopSlug: string;
  showMember: boolean;
  pageInfo?: PageInfo;
  sortable?: string[];
}) {
  const columns: DataColumn<ReservationRow>[] = [
    col.accessor('id', { id: 'created_at', header: '#', meta: { label: 'Order made' }, cell: (c) => c.getValue() }),
    ...(showMember
      ? [col.accessor('memberName', { meta: { priority: 'key' }, header: 'Member', cell: (c) => c.getValue() })]
      : []),
    col.accessor('tankName', { header: 'Tank', cell: (c) => c.getValue() }),
    col.accessor('quantityLiters', {
      meta: { priority: 'key' },
      id: 'quantity',
      header: 'Quantity',
      cell: (c) => <span className="tabular-nums">{formatMl(Math.round(c.getValue() * 1000), units)}</span>,
    }),
    col.accessor('windowEnd', {
      id: 'window_end',
      meta: { priority: 'key' },
      header: 'Window',
      cell: (c) =>
        `${formatWhen(c.row.original.windowStart, timeZone, { time: false })} – ${formatWhen(new Date(new Date(c.getValue()).getTime() - 1), timeZone, { time: false })}`,
    }),
    col.accessor('status', {
      meta: { priority: 'key' },
      id: 'status',
      header: 'Status',
      cell: (c) => (
        <StatusBadge
          status={c.getValue()}
          label={c.getValue() === 'drawn' && c.row.original.drawId ? `drawn (#${c.row.original.drawId})` : undefined}
        />
      ),
    }),
    col.display({
      id: 'actions',
      meta: { priority: 'key' },
      header: () => <span className="sr-only">Actions</span>,
      cell: (c) =>
        c.row.original.status === 'open' && c.row.original.canCancel ? (
          <CancelReservationButton
            coopSlug={coopSlug}
            reservationId={c.row.original.id}
            label={`reservation ${c.row.original.id}`}
            quantity={formatMl(Math.round(c.row.original.quantityLiters * 1000), units)}
          />
        ) : null,
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Reservations"
      sortable={sortable}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty="No reservations match."
    />
  );
}
