'use client';

import Link from 'next/link';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import type { BatchListRow } from '@/lib/brewing';
import type { UnitSystem } from '@/lib/units';
import { QualityBadge, StatusBadge, VerdictBadge } from './badges';
import { dateText, perUnit, vol } from './format';

/** A row of the batch list (lib/brewing' DTO). */
export type BatchTableRow = BatchListRow;

const col = createColumnHelper<Features, BatchTableRow>();

/** The batch list: number, date, status, volume released, cost per gallon/litre, quality. */
export function BatchTable({
  rows,
  slug,
  units,
  currency,
  pageInfo,
}: {
  rows: BatchTableRow[];
  slug: string;
  units: UnitSystem;
  currency: string;
  pageInfo: PageInfo;
}) {
  const columns: DataColumn<BatchTableRow>[] = [
    col.accessor('number', {
      id: 'number',
      meta: { priority: 'key' },
      header: 'Batch',
      cell: (c) => (
        <Link className="font-semibold" href={`/c/${slug}/batches/${c.row.original.id}`}>
          Batch {c.getValue()}
        </Link>
      ),
    }),
    col.accessor('batchDate', { id: 'date', header: 'Date', cell: (c) => dateText(c.getValue()) }),
    col.accessor('status', {
      meta: { priority: 'key' },
      id: 'status',
      header: 'Status',
      cell: (c) => <StatusBadge status={c.getValue()} />,
    }),
    col.accessor('releasedLiters', {
      id: 'volume',
      meta: { priority: 'key' },
      header: 'Released',
      cell: (c) =>
        c.getValue() == null ? (
          <span className="text-stone-600">— ({vol(c.row.original.oilLiters, units)} oil)</span>
        ) : (
          vol(c.getValue(), units)
        ),
    }),
    col.accessor('costPerGallonCents', {
      id: 'costPerGallon',
      header: units === 'us' ? 'Cost per gal' : 'Cost per L',
      cell: (c) => perUnit(c.row.original.costPerGallonCents, c.row.original.costPerLiterCents, units, currency),
    }),
    col.accessor('qualityVerdict', {
      id: 'quality',
      header: 'Quality',
      cell: (c) => (
        <span className="flex flex-wrap gap-1">
          <QualityBadge text={c.row.original.qualityText} kind={c.row.original.qualityKind} />
          <VerdictBadge
            verdict={c.row.original.screeningVerdict === 'incomplete' ? 'not tested' : c.row.original.screeningVerdict}
            prefix="Quick tests"
          />
        </span>
      ),
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Batches"
      sortable={['number', 'date', 'status', 'volume', 'costPerGallon']}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty="No batches match this filter."
    />
  );
}
