'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type DataColumn, type Features, type PageInfo } from '@/components/data-table/data-table';
import type { ChemicalLotDto } from '@/lib/supplies/chemical-lots';
import type { OilLotDto } from '@/lib/supplies/oil-lots';
import type { UnitSystem } from '@/lib/units';
import { dateText, grams, money, vol } from '@/components/brewing/format';
import { UploadForm } from '@/components/forms/upload-form';

/** The chemical-lot fields the table shows (lib/supplies' DTO). */
export type ChemicalRow = Pick<
  ChemicalLotDto,
  | 'id'
  | 'kind'
  | 'description'
  | 'supplier'
  | 'receivedOn'
  | 'unit'
  | 'quantity'
  | 'remaining'
  | 'totalCostCents'
  | 'purityPct'
  | 'hasSafetyDataSheet'
  | 'safetyDataSheetName'
>;
/** The oil-lot fields the table shows (lib/supplies' DTO). */
export type OilRow = Pick<
  OilLotDto,
  | 'id'
  | 'collectedFrom'
  | 'collectedOn'
  | 'volumeLiters'
  | 'usedLiters'
  | 'remainingLiters'
  | 'costCents'
  | 'waterNotes'
  | 'solidsNotes'
  | 'titrationMl'
  | 'titrant'
>;

const chem = createColumnHelper<Features, ChemicalRow>();
const oil = createColumnHelper<Features, OilRow>();

export function ChemicalTable({
  rows,
  slug,
  units,
  currency,
  pageInfo,
  canWrite,
}: {
  rows: ChemicalRow[];
  slug: string;
  units: UnitSystem;
  currency: string;
  pageInfo: PageInfo;
  canWrite: boolean;
}) {
  const amount = (r: ChemicalRow, q: number) => (r.unit === 'L' ? vol(q, units, 2) : grams(q));
  const columns: DataColumn<ChemicalRow>[] = [
    chem.accessor('receivedOn', { id: 'receivedOn', header: 'Received', cell: (c) => dateText(c.getValue()) }),
    chem.accessor('kind', {
      meta: { priority: 'key' },
      id: 'kind',
      header: 'Chemical',
      cell: (c) =>
        `${c.getValue() === 'other' ? c.row.original.description : c.getValue() === 'methanol' ? 'Methanol' : c.getValue()}${c.row.original.purityPct !== null ? ` (${c.row.original.purityPct} %)` : ''}`,
    }),
    chem.accessor('supplier', { id: 'supplier', header: 'Supplier' }),
    chem.accessor('quantity', { id: 'quantity', header: 'Bought', cell: (c) => amount(c.row.original, c.getValue()) }),
    chem.accessor('remaining', {
      meta: { priority: 'key' },
      id: 'remaining',
      header: 'Left',
      cell: (c) => amount(c.row.original, c.getValue()),
    }),
    chem.accessor('totalCostCents', { id: 'cost', header: 'Cost', cell: (c) => money(c.getValue(), currency) }),
    chem.display({
      id: 'sds',
      header: 'Safety data sheet',
      cell: (c) =>
        c.row.original.hasSafetyDataSheet ? (
          <a className="underline" href={`/api/coops/${slug}/supplies/chemicals/${c.row.original.id}/sds`}>
            PDF
          </a>
        ) : canWrite ? (
          <details>
            <summary className="cursor-pointer text-fir-700">Add</summary>
            <div className="mt-2 w-64">
              <UploadForm
                id={`sds-${c.row.original.id}`}
                target={{ to: 'sds', coop: slug, lotId: c.row.original.id }}
                accept="application/pdf"
                label="PDF"
              />
            </div>
          </details>
        ) : (
          <span className="text-stone-600">—</span>
        ),
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Chemical lots"
      sortable={['receivedOn', 'kind', 'supplier', 'remaining', 'cost']}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty="No chemical purchases recorded yet."
    />
  );
}

export function OilTable({
  rows,
  units,
  currency,
  pageInfo,
}: {
  rows: OilRow[];
  units: UnitSystem;
  currency: string;
  pageInfo: PageInfo;
}) {
  const columns: DataColumn<OilRow>[] = [
    oil.accessor('collectedOn', { id: 'collectedOn', header: 'Collected', cell: (c) => dateText(c.getValue()) }),
    oil.accessor('collectedFrom', { meta: { priority: 'key' }, id: 'collectedFrom', header: 'From' }),
    oil.accessor('volumeLiters', { id: 'volume', header: 'Volume', cell: (c) => vol(c.getValue(), units) }),
    oil.accessor('remainingLiters', {
      meta: { priority: 'key' },
      id: 'remainingLiters',
      header: 'Left',
      cell: (c) => vol(c.getValue(), units),
    }),
    oil.accessor('titrationMl', {
      id: 'titration',
      header: 'Titration',
      cell: (c) => (c.getValue() === null ? '—' : `${c.getValue()} mL ${c.row.original.titrant ?? ''}`),
    }),
    oil.accessor('costCents', { id: 'cost', header: 'Cost', cell: (c) => money(c.getValue(), currency) }),
    oil.display({
      id: 'notes',
      header: 'Water / solids',
      cell: (c) => [c.row.original.waterNotes, c.row.original.solidsNotes].filter(Boolean).join(' · ') || '—',
    }),
  ];
  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Oil lots"
      sortable={['collectedOn', 'collectedFrom', 'volume', 'titration']}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty="No oil collected yet."
    />
  );
}
