'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { DataTable } from '@/components/data-table/data-table';
import { callApi } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import type { IMPORT_KINDS } from '@/lib/validation/imports';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { openingImportColumns, type OpeningImportRow } from './opening-columns';

/** An opening-records import: its rows, the result download, and undo (asked twice). */
export function OpeningResult(p: {
  coopSlug: string;
  kind: string;
  importId: number;
  undone: boolean;
  fileColumns: { key: string; heading: string }[];
  rows: OpeningImportRow[];
}) {
  const router = useRouter();
  const [asking, setAsking] = useState(false);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);
  const url = `/api/coops/${p.coopSlug}/imports/${p.kind}/${p.importId}`;

  async function undo() {
    setBusy(true);
    const path = { coop: p.coopSlug, kind: p.kind as (typeof IMPORT_KINDS)[number], id: String(p.importId) };
    const r = await callApi(() => apiClient.POST('/api/coops/{coop}/imports/{kind}/{id}/undo', { params: { path } }));
    setBusy(false);
    setAsking(false);
    setMessage(
      r.ok
        ? { tone: 'ok', text: 'The import was undone: everything it recorded was taken back.' }
        : { tone: 'danger', text: r.error },
    );
    if (r.ok) router.refresh();
  }

  return (
    <div className="flex flex-col gap-4">
      <div aria-live="polite">{message ? <Notice tone={message.tone}>{message.text}</Notice> : null}</div>
      <p className="text-sm">
        <a href={`${url}/result`} download>
          Download the result (CSV)
        </a>
      </p>
      {p.undone ? null : asking ? (
        <div className="flex flex-wrap items-center gap-2">
          <span className="text-sm">Take back everything this import recorded?</span>
          <Button type="button" variant="danger" disabled={busy} onClick={() => void undo()}>
            {busy ? 'Undoing…' : 'Yes, undo the import'}
          </Button>
          <Button type="button" variant="secondary" onClick={() => setAsking(false)}>
            Keep it
          </Button>
        </div>
      ) : (
        <div>
          <Button type="button" variant="secondary" onClick={() => setAsking(true)}>
            Undo this import
          </Button>
        </div>
      )}
      <DataTable
        caption="Every row of the file and what it recorded"
        columns={openingImportColumns(p.fileColumns)}
        data={p.rows}
        getRowId={(r) => String(r.line)}
      />
    </div>
  );
}
