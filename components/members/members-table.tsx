'use client';

import { useRouter } from 'next/navigation';
import { useMemo, useState } from 'react';
import { DataTable, type PageInfo } from '@/components/data-table/data-table';
import { callApi } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import type { ConfirmOutcome } from '@/components/ui/confirm-dialog';
import { withArticle, type Role } from '@/lib/auth/roles';
import { memberColumns, type MemberRow } from './member-columns';

/** The members table with its row actions (role, suspend/reinstate, remove), each confirmed; the server re-checks every one. */
export function MembersTable({
  coopSlug,
  rows,
  pageInfo,
  filtered,
}: {
  coopSlug: string;
  rows: MemberRow[];
  pageInfo: PageInfo;
  filtered: boolean;
}) {
  const router = useRouter();
  const [pendingRole, setPendingRole] = useState<Record<number, Role>>({});

  const columns = useMemo(() => {
    async function run(
      row: MemberRow,
      change: { role?: Role; status?: 'active' | 'suspended' } | null,
      okText: string,
    ): Promise<ConfirmOutcome> {
      const path = { coop: coopSlug, id: String(row.id) };
      const r = change
        ? await callApi((b) => apiClient.PATCH('/api/coops/{coop}/members/{id}', { params: { path }, body: b }), {
            schema: 'membershipUpdateSchema',
            body: change,
          })
        : await callApi(() => apiClient.DELETE('/api/coops/{coop}/members/{id}', { params: { path } }));
      if (!r.ok) return { ok: false, error: r.error };
      setPendingRole((p) => {
        const next = { ...p };
        delete next[row.id];
        return next;
      });
      router.refresh();
      return { ok: true, message: okText };
    }
    return memberColumns({
      pendingRole,
      pickRole: (row, role) => setPendingRole((p) => ({ ...p, [row.id]: role })),
      saveRole: (row, role) => run(row, { role }, `${row.name} is now ${withArticle(role)}.`),
      setStatus: (row, status) =>
        run(
          row,
          { status },
          status === 'suspended'
            ? `${row.name} is suspended; they can no longer open the co-op.`
            : `${row.name} is reinstated.`,
        ),
      remove: (row) => run(row, null, `${row.name} was removed from the co-op.`),
    });
  }, [pendingRole, coopSlug, router]);

  return (
    <DataTable
      columns={columns}
      data={rows}
      caption="Members of the co-op"
      sortable={['name', 'email', 'role', 'status', 'joined']}
      pageInfo={pageInfo}
      getRowId={(r) => String(r.id)}
      empty={filtered ? 'No members match these filters.' : 'No members yet. Invite someone above.'}
    />
  );
}
