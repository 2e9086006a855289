'use client';

import { useRouter } from 'next/navigation';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { numberOf, useApiForm } from '@/components/forms/use-api-form';
import { batchPath } from '@/components/brewing/batch-path';
import { apiClient } from '@/lib/api/client';
import { limitsFor, type FuelStandard } from '@/lib/quality';
import { SubmitButton } from '@/components/forms/submit-button';

/**
 * A laboratory result that arrived after the batch was released. A result outside a required
 * limit puts the batch under review (its fuel is held and the members who drew it are e-mailed).
 */
export function LateLabForm({ url, standard }: { url: string; standard: FuelStandard }) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  const rows = limitsFor(standard).filter((r) => !r.reportOnly);
  const err = (k: string) => fields[`labResults.${k}`] ?? fields.labResults;

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const d = new FormData(e.currentTarget);
    const property = String(d.get('property') ?? '');
    const body = {
      labResults: {
        [property]: {
          value: numberOf(String(d.get('value') ?? '')) as number,
          method: String(d.get('method') ?? ''),
          laboratory: String(d.get('laboratory') ?? ''),
          date: String(d.get('date') ?? ''),
        },
      },
    };
    const r = await send(
      (b) =>
        apiClient.POST('/api/coops/{coop}/batches/{id}/lab-results', { params: { path: batchPath(url) }, body: b }),
      { schema: 'lateLabResultSchema', body },
    );
    if (r) router.refresh();
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Record a late laboratory result">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <SelectField label="Property" name="property" defaultValue={rows[0]?.property} errors={fields.labResults}>
          {rows.map((r) => (
            <option key={r.property} value={r.property}>
              {r.label} ({r.limitText})
            </option>
          ))}
        </SelectField>
        <TextField
          label="Value"
          name="value"
          inputMode="decimal"
          required
          errors={Object.entries(fields).find(([k]) => k.endsWith('.value'))?.[1] ?? err('value')}
        />
        <TextField
          label="Laboratory"
          name="laboratory"
          required
          errors={Object.entries(fields).find(([k]) => k.endsWith('.laboratory'))?.[1]}
        />
        <TextField
          label="Test method"
          name="method"
          required
          hint="e.g. ASTM D664"
          errors={Object.entries(fields).find(([k]) => k.endsWith('.method'))?.[1]}
        />
        <TextField
          label="Date tested"
          name="date"
          type="date"
          required
          errors={Object.entries(fields).find(([k]) => k.endsWith('.date'))?.[1]}
        />
      </div>
      <div>
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Record lab result'}</SubmitButton>
      </div>
    </form>
  );
}
