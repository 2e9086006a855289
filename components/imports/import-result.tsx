'use client';

import { useEffect } from 'react';
import useSWR from 'swr';
import { DataTable } from '@/components/data-table/data-table';
import { Notice } from '@/components/ui/notice';
import type { ImportDetail } from '@/lib/imports/history';
import type { ImportKindName } from '@/lib/validation/imports';
import { apiClient, dataOrThrow } from '@/lib/api/client';
import { invitationImportColumns, type InvitationImportRow } from './invitation-columns';

/** An import's rows with live e-mail delivery (polled every 2 s while e-mails are waiting), and the result download. */
export function ImportResult({
  coopSlug,
  kind,
  initial,
  fateLabels,
}: {
  coopSlug: string;
  kind: ImportKindName;
  initial: ImportDetail;
  fateLabels: Record<string, string>;
}) {
  const url = `/api/coops/${coopSlug}/imports/${kind}/${initial.import.id}`;
  const { data, error, mutate } = useSWR(
    url,
    () =>
      dataOrThrow(
        apiClient.GET('/api/coops/{coop}/imports/{kind}/{id}', {
          params: { path: { coop: coopSlug, kind, id: String(initial.import.id) } },
        }),
      ),
    { fallbackData: initial },
  );
  const waiting = (data?.progress?.queued ?? 0) > 0;
  useEffect(() => {
    if (!waiting) return;
    const timer = setInterval(() => void mutate(), 2000);
    return () => clearInterval(timer);
  }, [waiting, mutate]);
  const d = data ?? initial;
  const p = d.progress;
  const total = p ? p.queued + p.sent + p.notSent : 0;
  const rows: InvitationImportRow[] = d.rows.map((r) => ({
    line: r.line,
    name: r.values.name ?? '',
    email: r.values.email ?? '',
    role: r.values.role ?? '',
    fate: r.fate,
    fateLabel: fateLabels[r.fate] ?? r.fate,
    message: r.values.message ?? '',
    field: null,
    delivery: r.delivery,
    invitationStatus: r.invitationStatus,
  }));
  return (
    <div className="flex flex-col gap-4">
      {p ? (
        <div className="flex flex-col gap-2" aria-live="polite">
          <label htmlFor="mail-progress" className="text-sm font-medium">
            E-mails sent: {p.sent} of {total}
            {p.notSent ? ` · ${p.notSent} could not be sent (resend them from Members)` : ''}
          </label>
          <progress id="mail-progress" max={Math.max(total, 1)} value={p.sent + p.notSent} className="h-3 w-full" />
        </div>
      ) : null}
      {error ? (
        <Notice tone="warn">Could not refresh the delivery status just now; it updates again shortly.</Notice>
      ) : null}
      <p className="text-sm">
        <a href={`${url}/result`} download>
          Download the result (CSV)
        </a>
      </p>
      <DataTable
        caption="Every row of the file and what happened to it"
        columns={invitationImportColumns(true)}
        data={rows}
        getRowId={(r) => String(r.line)}
      />
    </div>
  );
}
