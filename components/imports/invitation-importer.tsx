'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { DataTable } from '@/components/data-table/data-table';
import { callApi } from '@/components/forms/use-api-form';
import { useChosenFile } from '@/components/forms/use-chosen-file';
import { apiClient } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { FieldErrors } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { invitationImportColumns, type InvitationImportRow } from './invitation-columns';

interface Preview {
  fileName: string;
  rows: Omit<InvitationImportRow, 'fateLabel'>[];
  counts: Record<string, number>;
  ignoredHeadings: string[];
  earlierImport: { id: number; createdAt: string; createdBy: string | null } | null;
}

const COUNT_WORDS: [string, string][] = [
  ['invite', 'will be invited'],
  ['member', 'already members'],
  ['invited', 'already invited'],
  ['duplicate', 'duplicates in the file'],
  ['bad-email', 'bad e-mail'],
  ['bad-role', 'unknown role'],
  ['bad-name', 'bad name'],
];

/**
 * Bulk invitations: choose a CSV file (or paste rows), see each row's fate, then confirm. Nothing
 * is saved until "Invite"; the e-mails then go out from the job queue and the result page follows
 * them row by row.
 */
export function InvitationImporter({ coopSlug, fateLabels }: { coopSlug: string; fateLabels: Record<string, string> }) {
  const router = useRouter();
  const [fileName, setFileName] = useState('');
  const [csv, setCsv] = useState('');
  const [pasted, setPasted] = useState('');
  const [preview, setPreview] = useState<Preview | null>(null);
  const [busy, setBusy] = useState<'preview' | 'confirm' | null>(null);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [onlyProblems, setOnlyProblems] = useState(false);

  const path = { coop: coopSlug, kind: 'invitations' as const };

  async function choose(file: File | undefined) {
    setPreview(null);
    setErrors({});
    setMessage(null);
    if (!file) return;
    setFileName(file.name);
    setCsv(await file.text());
    setPasted('');
  }
  const chosenFile = useChosenFile((f) => void choose(f));

  function body() {
    if (pasted.trim() !== '') return { fileName: 'pasted rows', csv: pasted };
    return { fileName, csv };
  }

  async function runPreview() {
    setBusy('preview');
    setMessage(null);
    // The imports' answers are not declared field by field yet: the preview is read as this screen's shape.
    const r = await callApi(
      (b) => apiClient.POST('/api/coops/{coop}/imports/{kind}/preview', { params: { path }, body: b }),
      { schema: 'importFileSchema', body: body() },
    );
    setBusy(null);
    if (!r.ok) {
      setPreview(null);
      setErrors(r.fields);
      setMessage(r.error);
      return;
    }
    setErrors({});
    setPreview(r.data as unknown as Preview);
  }

  async function confirm() {
    setBusy('confirm');
    setMessage(null);
    const r = await callApi((b) => apiClient.POST('/api/coops/{coop}/imports/{kind}', { params: { path }, body: b }), {
      schema: 'importFileSchema',
      body: body(),
    });
    if (!r.ok) {
      setBusy(null);
      setErrors(r.fields);
      setMessage(r.error);
      return;
    }
    router.push(`/c/${coopSlug}/imports/invitations/${String(r.data.importId)}`);
  }

  const rows: InvitationImportRow[] = (preview?.rows ?? []).map((r) => ({
    ...r,
    fateLabel: fateLabels[r.fate] ?? r.fate,
  }));
  const shown = onlyProblems ? rows.filter((r) => r.fate !== 'invite') : rows;
  const inviting = preview?.counts.invite ?? 0;
  const ready = Boolean(csv || pasted.trim());

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-4 md:grid-cols-2">
        <div className="flex min-w-0 flex-col gap-1">
          <label htmlFor="invitations-file" className="text-sm font-medium text-stone-800">
            CSV file
          </label>
          <input
            id="invitations-file"
            type="file"
            accept=".csv,text/csv,text/plain"
            aria-describedby="invitations-file-hint"
            className="min-h-11 w-full min-w-0 rounded-lg border border-stone-300 bg-white px-3 py-2 text-base"
            {...chosenFile}
          />
          <p id="invitations-file-hint" className="text-xs text-stone-600">
            Saved from a spreadsheet as CSV: commas, semicolons or tabs all work.
          </p>
        </div>
        <div className="flex min-w-0 flex-col gap-1">
          <label htmlFor="invitations-paste" className="text-sm font-medium text-stone-800">
            Or paste rows (with the heading row)
          </label>
          <textarea
            id="invitations-paste"
            rows={4}
            value={pasted}
            placeholder={'Name,E-mail,Role\nWren Castellano,wren@example.org,member'}
            aria-invalid={errors.csv?.length ? true : undefined}
            aria-describedby={errors.csv?.length ? 'csv-error' : undefined}
            className="w-full min-w-0 rounded-lg border border-stone-300 bg-white px-3 py-2 font-mono text-sm"
            onChange={(e) => {
              setPasted(e.currentTarget.value);
              setPreview(null);
            }}
          />
        </div>
      </div>
      <FieldErrors id="csv-error" errors={errors.csv ?? errors.fileName} />
      <div aria-live="polite">{message && !errors.csv ? <Notice tone="danger">{message}</Notice> : null}</div>
      <div>
        <Button type="button" variant="secondary" disabled={!ready || busy !== null} onClick={() => void runPreview()}>
          {busy === 'preview' ? 'Reading…' : 'Preview'}
        </Button>
      </div>

      {preview ? (
        <section aria-labelledby="preview-heading" className="flex flex-col gap-3">
          <h3 id="preview-heading" className="text-base font-semibold">
            Preview of {preview.fileName} — nothing is saved yet
          </h3>
          <ul className="flex flex-wrap gap-2 text-sm">
            {COUNT_WORDS.filter(([k]) => (preview.counts[k] ?? 0) > 0).map(([k, words]) => (
              <li key={k} className="rounded-full bg-stone-100 px-3 py-1">
                <strong>{preview.counts[k]}</strong> {words}
              </li>
            ))}
          </ul>
          {preview.ignoredHeadings.length ? (
            <Notice tone="info">Columns not used: {preview.ignoredHeadings.join(', ')}.</Notice>
          ) : null}
          {preview.earlierImport ? (
            <Notice tone="warn" title="This file was already imported">
              {preview.earlierImport.createdBy ? `${preview.earlierImport.createdBy} imported it` : 'It was imported'}{' '}
              on {new Date(preview.earlierImport.createdAt).toLocaleString()}. Nobody is invited twice: change the file
              to invite new people.
            </Notice>
          ) : null}
          <label className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              checked={onlyProblems}
              onChange={(e) => setOnlyProblems(e.currentTarget.checked)}
              className="h-5 w-5"
            />
            Show only rows that will not be invited
          </label>
          <DataTable
            caption="Rows of the file and what will happen to each"
            columns={invitationImportColumns(false)}
            data={shown}
            getRowId={(r) => String(r.line)}
            empty="Every row will be invited."
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button
              type="button"
              disabled={busy !== null || inviting === 0 || Boolean(preview.earlierImport)}
              onClick={() => void confirm()}
            >
              {busy === 'confirm' ? 'Inviting…' : `Invite ${inviting} ${inviting === 1 ? 'person' : 'people'}`}
            </Button>
            <p className="text-sm text-stone-600">
              Rows that will not be invited are skipped; fix them in the file and import it again.
            </p>
          </div>
        </section>
      ) : null}
    </div>
  );
}
