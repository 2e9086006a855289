'use client';

import Link from 'next/link';
import { usePathname, useSearchParams } from 'next/navigation';
import { tableFeatures, useTable, type ColumnDef, type RowData } from '@tanstack/react-table';
import type { ReactNode } from 'react';

export const tableFeaturesBasic = tableFeatures({});
export type Features = typeof tableFeaturesBasic;
/** Column definitions for DataTable: build them with createColumnHelper<Features, Row>(). */
export type DataColumn<Row extends RowData> = ColumnDef<Features, Row, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

export interface PageInfo {
  page: number;
  pageSize: number;
  total: number;
}

/**
 * One table for every list in the app, over @tanstack/react-table. Sorting and paging live in
 * the URL (`?sort=col&dir=asc&page=2`) and are done by the server; `sortable` names the column
 * ids the server accepts. Wide tables scroll sideways inside their box on phones.
 */
export function DataTable<Row extends RowData>({
  columns,
  data,
  caption,
  sortable = [],
  pageInfo,
  empty,
  getRowId,
}: {
  columns: DataColumn<Row>[];
  data: Row[];
  caption: string;
  sortable?: string[];
  pageInfo?: PageInfo;
  empty?: ReactNode;
  getRowId?: (row: Row) => string;
}) {
  const table = useTable({ features: tableFeaturesBasic, columns, data, getRowId: getRowId ? (r: Row) => getRowId(r) : undefined });
  const params = useSearchParams();
  const pathname = usePathname();
  const sort = params.get('sort');
  const dir = params.get('dir') === 'desc' ? 'desc' : 'asc';
  const href = (changes: Record<string, string | null>) => {
    const p = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(changes)) {
      if (v === null) p.delete(k);
      else p.set(k, v);
    }
    return `${pathname}?${p.toString()}`;
  };

  if (data.length === 0) {
    return (
      <div role="status" className="rounded-xl border border-dashed border-stone-300 bg-white px-4 py-8 text-center text-stone-600">
        {empty ?? 'Nothing here yet.'}
      </div>
    );
  }
  return (
    <div className="overflow-hidden rounded-xl border border-stone-200 bg-white shadow-sm">
      {/* Focusable so keyboard users can scroll a wide table sideways on a phone; relative keeps
          visually hidden (absolute) header text inside the scroll box. */}
      <div className="relative overflow-x-auto" tabIndex={0} role="region" aria-label={caption}>
        <table className="w-full min-w-[36rem] border-collapse text-left text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-stone-100 text-xs uppercase tracking-wide text-stone-700">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const id = header.column.id;
                  const canSort = sortable.includes(id);
                  const active = sort === id;
                  return (
                    <th key={header.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : undefined}>
                      {header.isPlaceholder ? null : canSort ? (
                        <Link className="inline-flex items-center gap-1 text-stone-800 no-underline hover:underline" href={href({ sort: id, dir: active && dir === 'asc' ? 'desc' : 'asc', page: null })}>
                          <table.FlexRender header={header} />
                          <span aria-hidden="true">{active ? (dir === 'asc' ? '▲' : '▼') : '↕'}</span>
                        </Link>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="border-t border-stone-100 hover:bg-stone-50">
                  {row.getAllCells().map((cell) => (
                    <td key={cell.id} className="px-3 py-2 align-top">
                      <table.FlexRender cell={cell} />
                    </td>
                  ))}
                </tr>
              ))}
          </tbody>
        </table>
      </div>
      {pageInfo && pageInfo.total > pageInfo.pageSize ? <Pager pageInfo={pageInfo} href={href} /> : null}
    </div>
  );
}

function Pager({ pageInfo, href }: { pageInfo: PageInfo; href: (c: Record<string, string | null>) => string }) {
  const pages = Math.max(1, Math.ceil(pageInfo.total / pageInfo.pageSize));
  const { page } = pageInfo;
  return (
    <nav aria-label="Pages" className="flex items-center justify-between gap-2 border-t border-stone-200 px-3 py-2 text-sm">
      <span className="text-stone-600">
        Page {page} of {pages} · {pageInfo.total} rows
      </span>
      <span className="flex gap-2">
        {page > 1 ? <Link className="rounded border border-stone-300 px-3 py-1.5 no-underline" href={href({ page: String(page - 1) })}>Previous</Link> : null}
        {page < pages ? <Link className="rounded border border-stone-300 px-3 py-1.5 no-underline" href={href({ page: String(page + 1) })}>Next</Link> : null}
      </span>
    </nav>
  );
}
