'use client';

import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { SubmitButton } from '@/components/forms/submit-button';

export function CreateCoopForm() {
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = formObject(e.currentTarget);
    const body = {
      name: f.name ?? '',
      slug: f.slug ?? '',
      units: f.units as 'us' | 'metric' | undefined,
      timezone: f.timezone,
    };
    const created = await send((b) => apiClient.POST('/api/coops', { body: b }), { schema: 'coopCreateSchema', body });
    if (created) window.location.assign(`/c/${created.slug}`);
  }
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <TextField label="Co-op name" name="name" required errors={fields.name} />
      <TextField
        label="Web address"
        name="slug"
        required
        errors={fields.slug}
        hint="Lower-case letters, digits and dashes, e.g. riverbend-fuel"
      />
      <SelectField label="Units" name="units" defaultValue="us" errors={fields.units}>
        <option value="us">US gallons and °F</option>
        <option value="metric">Litres and °C</option>
      </SelectField>
      <TextField
        label="Time zone"
        name="timezone"
        defaultValue="America/Chicago"
        errors={fields.timezone}
        hint="An IANA name such as America/Chicago"
      />
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Creating…' : 'Create co-op'}</SubmitButton>
      </div>
    </form>
  );
}
