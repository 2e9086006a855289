'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { DataTable } from '@/components/data-table/data-table';
import { callApi } from '@/components/forms/use-api-form';
import { useChosenFile } from '@/components/forms/use-chosen-file';
import { apiClient } from '@/lib/api/client';
import type { IMPORT_KINDS } from '@/lib/validation/imports';
import { Button } from '@/components/ui/button';
import { FieldErrors } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { openingImportColumns, type OpeningImportRow } from './opening-columns';

interface Preview {
  fileName: string;
  rows: OpeningImportRow[];
  counts: { ready: number; errors: number };
  ignoredHeadings: string[];
  earlierImport: { id: number; createdAt: string; createdBy: string | null } | null;
}

/**
 * An opening-records import (balances, tank stock …): choose a CSV file, see every row checked
 * field by field, then import all rows at once. Nothing is saved until "Import"; one wrong row
 * stops the whole import, so fix the file and preview again.
 */
export function OpeningImporter({
  coopSlug,
  kind,
  fileColumns,
}: {
  coopSlug: string;
  kind: string;
  fileColumns: { key: string; heading: string }[];
}) {
  const router = useRouter();
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [busy, setBusy] = useState<'preview' | 'confirm' | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  // The page offers only the import kinds.
  const path = { coop: coopSlug, kind: kind as (typeof IMPORT_KINDS)[number] };
  const inputId = `${kind}-file`;

  async function choose(f: File | undefined) {
    setPreview(null);
    setError(null);
    setDone(null);
    setFile(f ? { name: f.name, text: await f.text() } : null);
  }
  const chosenFile = useChosenFile((f) => void choose(f));

  async function runPreview() {
    if (!file) return;
    setBusy('preview');
    setError(null);
    // The imports' answers are not declared field by field yet: the preview is read as this screen's shape.
    const r = await callApi(
      (b) => apiClient.POST('/api/coops/{coop}/imports/{kind}/preview', { params: { path }, body: b }),
      { schema: 'importFileSchema', body: { fileName: file.name, csv: file.text } },
    );
    setBusy(null);
    if (!r.ok) return setError(r.error);
    setPreview(r.data as unknown as Preview);
  }

  async function confirm() {
    if (!file) return;
    setBusy('confirm');
    setError(null);
    const r = await callApi((b) => apiClient.POST('/api/coops/{coop}/imports/{kind}', { params: { path }, body: b }), {
      schema: 'importFileSchema',
      body: { fileName: file.name, csv: file.text },
    });
    setBusy(null);
    if (!r.ok) {
      if (Array.isArray(r.body.rows))
        setPreview((p) =>
          p
            ? { ...p, rows: p.rows.map((x) => (r.body.rows as OpeningImportRow[]).find((b) => b.line === x.line) ?? x) }
            : p,
        );
      return setError(r.error);
    }
    setPreview(null);
    setFile(null);
    // The answer of an opening-records import (the invitations kind answers invited/skipped).
    const imported = 'imported' in r.data ? r.data.imported : 0;
    setDone(`Imported ${imported} row${imported === 1 ? '' : 's'}.`);
    router.refresh();
  }

  const blocked = !preview || preview.counts.errors > 0 || Boolean(preview.earlierImport);
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-col gap-1">
        <label htmlFor={inputId} className="text-sm font-medium text-stone-800">
          CSV file
        </label>
        <input
          id={inputId}
          type="file"
          accept=".csv,text/csv,text/plain"
          aria-describedby={error ? `${inputId}-error` : undefined}
          className="min-h-11 w-full min-w-0 rounded-lg border border-stone-300 bg-white px-3 py-2 text-base"
          {...chosenFile}
        />
        <FieldErrors id={`${inputId}-error`} errors={error ? [error] : undefined} />
      </div>
      <div aria-live="polite">{done ? <Notice tone="ok">{done} See it under Earlier imports.</Notice> : null}</div>
      <div>
        <Button type="button" variant="secondary" disabled={!file || busy !== null} onClick={() => void runPreview()}>
          {busy === 'preview' ? 'Reading…' : 'Preview'}
        </Button>
      </div>
      {preview ? (
        <section aria-label={`Preview of ${preview.fileName}`} className="flex flex-col gap-3">
          <p className="text-sm">
            <strong>{preview.counts.ready}</strong> ready ·{' '}
            <strong className={preview.counts.errors ? 'text-danger-700' : ''}>{preview.counts.errors}</strong> with
            problems — nothing is saved yet.
          </p>
          {preview.ignoredHeadings.length ? (
            <Notice tone="info">Columns not used: {preview.ignoredHeadings.join(', ')}.</Notice>
          ) : null}
          {preview.earlierImport ? (
            <Notice tone="warn" title="This file was already imported">
              Undo that import first if you mean to import it again.
            </Notice>
          ) : null}
          {preview.counts.errors > 0 ? (
            <Notice tone="warn">
              Every row must be right before anything is imported: fix the rows marked below in your spreadsheet, save
              it as CSV again and preview it.
            </Notice>
          ) : null}
          <DataTable
            caption={`Rows of ${preview.fileName}, checked`}
            columns={openingImportColumns(fileColumns)}
            data={preview.rows}
            getRowId={(r) => String(r.line)}
          />
          <div>
            <Button type="button" disabled={blocked || busy !== null} onClick={() => void confirm()}>
              {busy === 'confirm'
                ? 'Importing…'
                : `Import ${preview.counts.ready} row${preview.counts.ready === 1 ? '' : 's'}`}
            </Button>
          </div>
        </section>
      ) : null}
    </div>
  );
}
