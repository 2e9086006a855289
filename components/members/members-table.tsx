'use client';

import { useRouter } from 'next/navigation';
import { useMemo, useState } from 'react';
import { DataTable, type PageInfo } from '@/components/data-table/data-table';
import { sendJson } from '@/components/forms/use-api-form';
import { Notice } from '@/components/ui/notice';
import type { Role } from '@/lib/auth/roles';
import { memberColumns, type MemberRow } from './member-columns';

/** The members table with its row actions (role, suspend/reinstate, remove); the server re-checks every one. */
export function MembersTable({ coopSlug, rows, pageInfo, filtered }: { coopSlug: string; rows: MemberRow[]; pageInfo: PageInfo; filtered: boolean }) {
  const router = useRouter();
  const [busyId, setBusyId] = useState<number | null>(null);
  const [confirmingRemove, setConfirmingRemove] = useState<number | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);

  const columns = useMemo(() => {
    async function run(row: MemberRow, method: 'PATCH' | 'DELETE', body: unknown, okText: string) {
      setBusyId(row.id);
      setMessage(null);
      const r = await sendJson(`/api/coops/${coopSlug}/members/${row.id}`, method, body);
      setBusyId(null);
      setConfirmingRemove(null);
      setMessage(r.ok ? { tone: 'ok', text: okText } : { tone: 'danger', text: r.error });
      if (r.ok) router.refresh();
    }
    return memberColumns({
      busyId,
      confirmingRemove,
      setRole: (row, role: Role) => run(row, 'PATCH', { role }, `${row.name} is now ${role === 'admin' ? 'an' : 'a'} ${role}.`),
      setStatus: (row, status) =>
        run(row, 'PATCH', { status }, status === 'suspended' ? `${row.name} is suspended; they can no longer open the co-op.` : `${row.name} is reinstated.`),
      askRemove: (row) => setConfirmingRemove(row ? row.id : null),
      remove: (row) => run(row, 'DELETE', undefined, `${row.name} was removed from the co-op.`),
    });
  }, [busyId, confirmingRemove, coopSlug, router]);

  return (
    <div className="flex flex-col gap-3">
      <div aria-live="polite">{message ? <Notice tone={message.tone}>{message.text}</Notice> : null}</div>
      <DataTable
        columns={columns}
        data={rows}
        caption="Members of the co-op"
        sortable={['name', 'email', 'role', 'status', 'joined']}
        pageInfo={pageInfo}
        getRowId={(r) => String(r.id)}
        empty={filtered ? 'No members match these filters.' : 'No members yet. Invite someone above.'}
      />
    </div>
  );
}
