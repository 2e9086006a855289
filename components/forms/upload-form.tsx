'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { SubmitButton } from './submit-button';
import { FieldErrors, SelectField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { apiClient, apiError } from '@/lib/api/client';

/** Where an upload goes: a batch's files (with a purpose) or a chemical lot's safety data sheet. */
export type UploadTarget =
  { to: 'batch-files'; coop: string; batchId: number } | { to: 'sds'; coop: string; lotId: number };
type Purpose = 'photo' | 'lab-report' | 'receipt';

/** The multipart body as built here (the declared body names the fields; the file itself is a Blob). */
const multipart = (fields: Record<string, string | Blob | undefined>) => () => {
  const data = new FormData();
  for (const [k, v] of Object.entries(fields)) if (v !== undefined) data.set(k, v);
  return data;
};

/** Sends one file through the typed client; resolves to the call's result (data or error). */
export function uploadFile(target: UploadTarget, file: File, purpose?: Purpose) {
  // The OpenAPI types say `string` for a binary field; the browser sends the File.
  const binary = file as unknown as string;
  return target.to === 'sds'
    ? apiClient.POST('/api/coops/{coop}/supplies/chemicals/{id}/sds', {
        params: { path: { coop: target.coop, id: String(target.lotId) } },
        body: { file: binary },
        bodySerializer: multipart({ file }),
      })
    : apiClient.POST('/api/coops/{coop}/batches/{id}/files', {
        params: { path: { coop: target.coop, id: String(target.batchId) } },
        body: { file: binary, purpose },
        bodySerializer: multipart({ file, purpose }),
      });
}

/** Uploads one file (multipart) with optional purpose; the server checks its type from its content. */
export function UploadForm({
  target,
  accept,
  label,
  purposes,
  id = 'file',
}: {
  target: UploadTarget;
  accept: string;
  label: string;
  purposes?: { value: Purpose; label: string }[];
  id?: string;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const data = new FormData(form);
    const file = data.get('file');
    if (!(file instanceof File) || file.size === 0) {
      setErrors({ file: ['Choose a file to upload.'] });
      return;
    }
    setBusy(true);
    setMessage(null);
    try {
      const purpose = (data.get('purpose') as Purpose | null) ?? undefined;
      const { response, error } = await uploadFile(target, file, purpose);
      if (response.ok) {
        setErrors({});
        setMessage({ tone: 'ok', text: 'Uploaded.' });
        form.reset();
        router.refresh();
      } else {
        const e = apiError(error, response.status);
        setErrors(e.fields);
        setMessage({ tone: 'danger', text: e.error });
      }
    } catch {
      setMessage({ tone: 'danger', text: 'Could not reach Tallyvat. Check your connection and try again.' });
    } finally {
      setBusy(false);
    }
  }

  const errId = `${id}-error`;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-2">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <div className="flex flex-wrap items-end gap-3">
        {purposes ? (
          <SelectField
            label="Kind"
            name="purpose"
            id={`${id}-purpose`}
            defaultValue={purposes[0]?.value}
            errors={errors.purpose}
          >
            {purposes.map((p) => (
              <option key={p.value} value={p.value}>
                {p.label}
              </option>
            ))}
          </SelectField>
        ) : null}
        <div className="flex min-w-0 max-w-full flex-col gap-1">
          <label htmlFor={id} className="text-sm font-medium text-stone-800">
            {label}
          </label>
          <input
            id={id}
            name="file"
            type="file"
            accept={accept}
            aria-describedby={errors.file?.length ? errId : undefined}
            className="min-h-11 w-full min-w-0 max-w-full rounded-lg border border-stone-300 bg-white px-2 py-2 text-sm"
          />
        </div>
        <SubmitButton variant="secondary" disabled={busy}>
          {busy ? 'Uploading…' : 'Upload'}
        </SubmitButton>
      </div>
      <FieldErrors id={errId} errors={errors.file} />
      <p className="text-xs text-stone-600">Up to 10 MB. The type is checked from the file itself.</p>
    </form>
  );
}
