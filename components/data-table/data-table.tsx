'use client';

import Link from 'next/link';
import { usePathname, useSearchParams } from 'next/navigation';
import {
  tableFeatures,
  useTable,
  type CellData,
  type ColumnDef,
  type RowData,
  type TableFeatures,
} from '@tanstack/react-table';
import { useState, type ReactNode } from 'react';
import { PhoneSort } from './phone-sort';

export const tableFeaturesBasic = tableFeatures({});
export type Features = typeof tableFeaturesBasic;
/** Column definitions for DataTable: build them with createColumnHelper<Features, Row>(). */
export type DataColumn<Row extends RowData> = ColumnDef<Features, Row, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

/* eslint-disable @typescript-eslint/no-unused-vars -- the augmented interface must repeat the library's type parameters */
declare module '@tanstack/table-core' {
  interface ColumnMeta<
    in out TFeatures extends TableFeatures,
    in out TData extends RowData,
    TValue extends CellData = CellData,
  > {
    /**
     * 'key': always shown on a phone (status, amount, the row's action and what names the row);
     * every other column goes behind the row's "Details" button there.
     */
    priority?: 'key';
    /** The label shown beside the value on a phone when the header is not plain text. */
    label?: string;
  }
}

export interface PageInfo {
  page: number;
  pageSize: number;
  total: number;
}

/** Column ids treated as key when a table declares no priorities at all. */
const DEFAULT_KEY_IDS = new Set(['status', 'actions', 'total', 'amount', 'quantity']);

/**
 * One table for every list in the app, over @tanstack/react-table. Sorting and paging live in
 * the URL (`?sort=col&dir=asc&page=2`) and are done by the server; `sortable` names the column
 * ids the server accepts.
 *
 * On a phone (below 640 px) each row becomes a card: columns whose `meta.priority` is 'key'
 * stay visible with their label, the rest open under the row's "Details" button — so status,
 * amount and the row's action never need sideways scrolling. Without any declared priority the
 * first column plus status, amount/total/quantity and actions are key. Above the cards, a
 * "Sort by" control stands in for the hidden sortable headers (same URL state).
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
  const table = useTable({
    features: tableFeaturesBasic,
    columns,
    data,
    getRowId: getRowId ? (r: Row) => getRowId(r) : undefined,
  });
  const params = useSearchParams();
  const pathname = usePathname();
  const [open, setOpen] = useState<Record<string, boolean>>({});
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
      <div
        role="status"
        className="rounded-xl border border-dashed border-stone-300 bg-white px-4 py-8 text-center text-stone-600"
      >
        {empty ?? 'Nothing here yet.'}
      </div>
    );
  }

  const leaf = table.getAllLeafColumns();
  const declared = leaf.some((c) => c.columnDef.meta?.priority);
  const isKey = (id: string, index: number) => {
    const c = leaf.find((l) => l.id === id);
    return declared ? c?.columnDef.meta?.priority === 'key' : index === 0 || DEFAULT_KEY_IDS.has(id);
  };
  const keyIds = new Set(leaf.filter((c, i) => isKey(c.id, i)).map((c) => c.id));
  const hasDetails = leaf.some((c) => !keyIds.has(c.id));
  const labelOf = (id: string) => {
    const def = leaf.find((l) => l.id === id)?.columnDef;
    return def?.meta?.label ?? (typeof def?.header === 'string' ? def.header : null);
  };

  const sortOptions = leaf
    .filter((c) => sortable.includes(c.id))
    .map((c) => ({ id: c.id, label: labelOf(c.id) ?? c.id }));

  return (
    <div className="overflow-hidden rounded-xl border border-stone-200 bg-white shadow-sm">
      {sortOptions.length ? (
        <PhoneSort
          caption={caption}
          options={sortOptions}
          sort={sort}
          dir={dir}
          hrefFor={(s, d) => href({ sort: s, dir: d, page: null })}
        />
      ) : null}
      {/* Focusable so keyboard users can scroll a wide table sideways on a tablet; on a phone rows
          are cards and nothing scrolls. relative keeps visually hidden header text inside the box. */}
      <div className="relative overflow-x-auto" tabIndex={0} role="region" aria-label={caption}>
        <table className="w-full border-collapse text-left text-sm max-sm:block sm:min-w-[36rem]">
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-stone-100 text-xs uppercase tracking-wide text-stone-700 max-sm:hidden">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const id = header.column.id;
                  const canSort = sortable.includes(id);
                  const active = sort === id;
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="px-3 py-2 font-semibold"
                      aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : undefined}
                    >
                      {header.isPlaceholder ? null : canSort ? (
                        <Link
                          className="inline-flex items-center gap-1 text-stone-800 no-underline hover:underline"
                          href={href({ sort: id, dir: active && dir === 'asc' ? 'desc' : 'asc', page: null })}
                        >
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
          <tbody className="max-sm:block">
            {table.getRowModel().rows.map((row) => {
              const expanded = open[row.id] === true;
              return (
                <tr
                  key={row.id}
                  className="border-t border-stone-100 hover:bg-stone-50 max-sm:flex max-sm:flex-wrap max-sm:items-end max-sm:gap-x-4 max-sm:gap-y-2 max-sm:px-3 max-sm:py-3 max-sm:first:border-t-0"
                >
                  {row.getAllCells().map((cell) => {
                    const id = cell.column.id;
                    const key = keyIds.has(id);
                    const label = id === 'actions' ? null : labelOf(id);
                    const phone = key
                      ? `max-sm:block max-sm:min-w-0 max-sm:p-0 ${id === 'actions' ? 'max-sm:ml-auto' : ''}`
                      : expanded
                        ? 'max-sm:order-2 max-sm:flex max-sm:basis-full max-sm:gap-2 max-sm:p-0'
                        : 'max-sm:hidden';
                    return (
                      <td key={cell.id} className={`px-3 py-2 align-top break-words ${phone}`}>
                        {/* The label is generated content (data-label), so a phone reader hears it with the value while
                            text searches and copied text find only the value. */}
                        {label ? (
                          <span
                            data-label={label}
                            className={`text-xs text-stone-600 before:content-[attr(data-label)] sm:hidden ${key ? 'block' : 'shrink-0 after:content-[":"]'}`}
                          />
                        ) : null}
                        <table.FlexRender cell={cell} />
                      </td>
                    );
                  })}
                  {hasDetails ? (
                    <td className="sm:hidden max-sm:order-1 max-sm:block max-sm:p-0">
                      <button
                        type="button"
                        aria-expanded={expanded}
                        onClick={() => setOpen((o) => ({ ...o, [row.id]: !expanded }))}
                        className="min-h-10 rounded-md px-2 text-sm font-semibold text-fir-700 underline-offset-2 hover:underline"
                      >
                        {expanded ? 'Hide details' : 'Details'}
                      </button>
                    </td>
                  ) : null}
                </tr>
              );
            })}
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
    <nav
      aria-label="Pages"
      className="flex flex-wrap items-center justify-between gap-2 border-t border-stone-200 px-3 py-2 text-sm"
    >
      <span className="text-stone-600">
        Page {page} of {pages} · {pageInfo.total} rows
      </span>
      <span className="flex gap-2">
        {page > 1 ? (
          <Link
            className="rounded border border-stone-300 px-3 py-1.5 no-underline"
            href={href({ page: String(page - 1) })}
          >
            Previous
          </Link>
        ) : null}
        {page < pages ? (
          <Link
            className="rounded border border-stone-300 px-3 py-1.5 no-underline"
            href={href({ page: String(page + 1) })}
          >
            Next
          </Link>
        ) : null}
      </span>
    </nav>
  );
}
