'use client';

import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, useApiForm } from '@/components/forms/use-api-form';

export function CreateCoopForm() {
  const { busy, fields, message, submit } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const created = await submit<{ slug: string }>('/api/coops', 'POST', formObject(e.currentTarget));
    if (created) window.location.assign(`/c/${created.slug}`);
  }
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      {message ? <div className="sm:col-span-2"><Notice tone={message.tone}>{message.text}</Notice></div> : null}
      <TextField label="Co-op name" name="name" required errors={fields.name} />
      <TextField label="Web address" name="slug" required errors={fields.slug} hint="Lower-case letters, digits and dashes, e.g. riverbend-fuel" />
      <SelectField label="Units" name="units" defaultValue="us" errors={fields.units}>
        <option value="us">US gallons and °F</option>
        <option value="metric">Litres and °C</option>
      </SelectField>
      <TextField label="Time zone" name="timezone" defaultValue="America/Chicago" errors={fields.timezone} hint="An IANA name such as America/Chicago" />
      <div className="sm:col-span-2"><Button type="submit" disabled={busy}>{busy ? 'Creating…' : 'Create co-op'}</Button></div>
    </form>
  );
}
