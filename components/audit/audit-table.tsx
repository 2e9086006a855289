'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type Features, type PageInfo } from '@/components/data-table/data-table';
import { formatWhen } from '@/lib/dates';
import { When } from '@/components/ui/when';
import { formatCents } from '@/lib/money';
import { formatVolume, type UnitSystem } from '@/lib/units';
import type { AuditEventDto } from '@/lib/audit/types';
import { auditSentence, fieldLabel } from './audit-words';

const col = createColumnHelper<Features, AuditEventDto>();

interface Shown {
  currency: string;
  units: UnitSystem;
  timeZone: string;
}

/** A stored value in words: money, volumes, dates and yes/no in the co-op's own style. */
function valueText(key: string, v: unknown, s: Shown): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  const n = typeof v === 'number' ? v : typeof v === 'string' && /^-?\d+(\.\d+)?$/.test(v) ? Number(v) : NaN;
  if (/cents$/i.test(key) && Number.isFinite(n)) return formatCents(Math.round(n), s.currency);
  if (/liters$/i.test(key) && Number.isFinite(n)) return formatVolume(n, s.units, 1);
  if (typeof v === 'string' && /^\d{4}-\d{2}-\d{2}(T[\d:.]+(Z|[+-]\d{2}:?\d{2})?)?$/.test(v))
    return formatWhen(v, s.timeZone, { time: v.length > 10 });
  if (Array.isArray(v)) return v.map((x) => valueText(key, x, s)).join(', ');
  if (typeof v === 'object')
    return Object.entries(v as Record<string, unknown>)
      .map(([k, x]) => `${fieldLabel(k)}: ${valueText(k, x, s)}`)
      .join('; ');
  return String(v);
}

/** Only the fields that changed, as a two-column "was / now" list. */
function Changes({ before, after, shown }: { before: unknown; after: unknown; shown: Shown }) {
  const b = (before ?? {}) as Record<string, unknown>;
  const a = (after ?? {}) as Record<string, unknown>;
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])].filter(
    (k) => JSON.stringify(b[k]) !== JSON.stringify(a[k]),
  );
  if (keys.length === 0) return <span className="text-stone-600">No values recorded</span>;
  const hasWas = keys.some((k) => k in b);
  return (
    <table className="w-full text-xs">
      <thead className="text-left text-stone-600">
        <tr>
          <th scope="col" className="pr-2 font-medium">
            Field
          </th>
          {hasWas ? (
            <th scope="col" className="pr-2 font-medium">
              Was
            </th>
          ) : null}
          <th scope="col" className="font-medium">
            Now
          </th>
        </tr>
      </thead>
      <tbody>
        {keys.slice(0, 8).map((k) => (
          <tr key={k} className="border-t border-stone-100 align-top">
            <th scope="row" className="pr-2 text-left font-medium text-stone-800">
              {fieldLabel(k)}
            </th>
            {hasWas ? (
              <td className="max-w-48 pr-2 break-words text-stone-700">{k in b ? valueText(k, b[k], shown) : '—'}</td>
            ) : null}
            <td className="max-w-48 break-words text-stone-900">{k in a ? valueText(k, a[k], shown) : '—'}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The audit log: when, a sentence saying who did what, the record, and what changed. */
export function AuditTable({
  rows,
  pageInfo,
  currency,
  units,
  timeZone,
}: { rows: AuditEventDto[]; pageInfo: PageInfo } & Shown) {
  const shown = { currency, units, timeZone };
  const columns = [
    col.accessor('at', {
      meta: { priority: 'key' },
      header: 'When',
      cell: (c) => <When value={c.getValue()} timeZone={timeZone} className="whitespace-nowrap" />,
    }),
    col.accessor('action', {
      meta: { priority: 'key' },
      header: 'What happened',
      cell: (c) => auditSentence(c.row.original),
    }),
    col.accessor('entityType', {
      header: 'Record',
      cell: (c) => `${fieldLabel(c.getValue())}${c.row.original.entityId ? ` #${c.row.original.entityId}` : ''}`,
    }),
    col.display({
      id: 'changes',
      header: 'Was / now',
      cell: (c) => <Changes before={c.row.original.before} after={c.row.original.after} shown={shown} />,
    }),
  ];
  return (
    <DataTable
      caption="Audit events, newest first"
      columns={columns}
      data={rows}
      pageInfo={pageInfo}
      getRowId={(r) => r.id}
      empty="No events match these filters."
    />
  );
}
