'use client';

import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, useApiForm } from '@/components/forms/use-api-form';
import { formatVolume, volumeLabel, type UnitSystem } from '@/lib/units';

/** Releases a tested batch into a tank: gallons (or litres) measured into the tank. */
export function ReleaseForm({ url, tanks, units }: { url: string; tanks: { id: number; name: string; capacityLiters: number; onHandLiters: number }[]; units: UnitSystem }) {
  const router = useRouter();
  const { busy, fields, message, submit } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (await submit(`${url}/release`, 'POST', formObject(e.currentTarget))) router.refresh();
  }
  if (!tanks.length) return <Notice tone="warn">There is no active tank to release into. Add a tank first.</Notice>;
  const problems = Object.entries(fields).filter(([k]) => k !== 'tankId' && k !== 'volume').flatMap(([, v]) => v);
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      {message ? <Notice tone={message.tone} title={message.tone === 'danger' ? message.text : undefined}>{problems.length ? <ul className="list-disc pl-5">{problems.map((p) => <li key={p}>{p}</li>)}</ul> : message.tone === 'ok' ? message.text : null}</Notice> : null}
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <SelectField label="Into tank" name="tankId" defaultValue={String(tanks[0]!.id)} errors={fields.tankId}>
          {tanks.map((t) => (
            <option key={t.id} value={t.id}>{t.name} — room for {formatVolume(Math.max(0, t.capacityLiters - t.onHandLiters), units, 0)}</option>
          ))}
        </SelectField>
        <TextField label={`Volume released (${volumeLabel(units)})`} name="volume" inputMode="decimal" errors={fields.volume} hint="Measured into the tank after drying." autoComplete="off" />
      </div>
      <p className="text-sm text-stone-700">Releasing takes the chemicals from stock (oldest lots first), works out the batch’s cost per {units === 'us' ? 'gallon' : 'litre'} and adds the fuel to the tank at that cost. It cannot be undone.</p>
      <div><Button type="submit" disabled={busy}>{busy ? 'Releasing…' : 'Release to tank'}</Button></div>
    </form>
  );
}
