'use client';

import { createColumnHelper } from '@tanstack/react-table';
import { DataTable, type Features, type PageInfo } from '@/components/data-table/data-table';
import type { AuditEventDto } from '@/lib/audit/types';

const col = createColumnHelper<Features, AuditEventDto>();

/** Shows only the fields that changed between before and after. */
function Changes({ before, after }: { before: unknown; after: unknown }) {
  const b = (before ?? {}) as Record<string, unknown>;
  const a = (after ?? {}) as Record<string, unknown>;
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])].filter((k) => JSON.stringify(b[k]) !== JSON.stringify(a[k]));
  if (keys.length === 0) return <span className="text-stone-500">—</span>;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-2 text-xs">
      {keys.slice(0, 8).map((k) => (
        <div key={k} className="contents">
          <dt className="font-medium text-stone-700">{k}</dt>
          <dd className="break-all">
            {k in b ? <span className="text-danger-700 line-through">{fmt(b[k])}</span> : null}
            {k in b && k in a ? ' → ' : null}
            {k in a ? <span className="text-ok-700">{fmt(a[k])}</span> : null}
          </dd>
        </div>
      ))}
    </dl>
  );
}
const fmt = (v: unknown) => (typeof v === 'string' ? v : JSON.stringify(v));

const columns = [
  col.accessor('at', { meta: { priority: 'key' }, header: 'When', cell: (c) => new Date(c.getValue()).toLocaleString('en-US', { dateStyle: 'medium', timeStyle: 'short' }) }),
  col.accessor('actorName', { meta: { priority: 'key' }, header: 'Who', cell: (c) => c.getValue() ?? 'system' }),
  col.accessor('action', { meta: { priority: 'key' }, header: 'What', cell: (c) => <code className="text-xs">{c.getValue()}</code> }),
  col.accessor('entityType', { header: 'Record', cell: (c) => `${c.getValue()}${c.row.original.entityId ? ` #${c.row.original.entityId}` : ''}` }),
  col.display({ id: 'changes', header: 'Before → after', cell: (c) => <Changes before={c.row.original.before} after={c.row.original.after} /> }),
];

export function AuditTable({ rows, pageInfo }: { rows: AuditEventDto[]; pageInfo: PageInfo }) {
  return <DataTable caption="Audit events, newest first" columns={columns} data={rows} pageInfo={pageInfo} getRowId={(r) => r.id} empty="No events match these filters." />;
}
