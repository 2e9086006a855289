'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useSWRConfig } from 'swr';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { unitWord } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';
import { prefixedErrors, prefixedObject } from './form-utils';
import { tanksKey } from './live-tanks';
import { SubmitButton } from '@/components/forms/submit-button';

interface TankLite {
  id: number;
  name: string;
  capacity: number;
  active: boolean;
}

/** Add a tank, or rename one, change its capacity, take it out of service or back in. */
export function TankSettingsForm({
  coopSlug,
  units,
  tanks,
}: {
  coopSlug: string;
  units: UnitSystem;
  tanks: TankLite[];
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const { busy, fields, message, send } = useApiForm();
  const [selected, setSelected] = useState<string>('new');
  const tank = tanks.find((t) => String(t.id) === selected);
  const errors = prefixedErrors(fields, 'tank');
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = prefixedObject(form, 'tank');
    const path = { coop: coopSlug };
    let ok: unknown;
    if (!tank) {
      const body = { name: f.name ?? '', capacity: f.capacity ?? '' };
      ok = await send(
        (b) => apiClient.POST('/api/coops/{coop}/tanks', { params: { path }, body: b }),
        { schema: 'tankCreateSchema', body },
        'Tank added.',
      );
      if (ok) form.reset();
    } else {
      const body = { name: f.name, capacity: f.capacity, active: f.active === 'true' };
      ok = await send(
        (b) =>
          apiClient.PATCH('/api/coops/{coop}/tanks/{tankId}', {
            params: { path: { ...path, tankId: String(tank.id) } },
            body: b,
          }),
        { schema: 'tankUpdateSchema', body },
        'Saved.',
      );
    }
    if (ok) {
      await mutate(tanksKey(coopSlug));
      router.refresh();
    }
  }
  return (
    <form
      key={selected}
      onSubmit={onSubmit}
      noValidate
      aria-label="Tank settings"
      className="grid gap-4 sm:grid-cols-2"
    >
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <SelectField label="Tank" name="tank-which" value={selected} onChange={(e) => setSelected(e.target.value)}>
        <option value="new">Add a new tank</option>
        {tanks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
            {t.active ? '' : ' (out of service)'}
          </option>
        ))}
      </SelectField>
      <TextField label="Name" name="tank-name" required defaultValue={tank?.name} errors={errors['tank-name']} />
      <TextField
        label={`Capacity (${unitWord(units)})`}
        name="tank-capacity"
        inputMode="decimal"
        autoComplete="off"
        required
        defaultValue={tank ? String(tank.capacity) : undefined}
        errors={errors['tank-capacity']}
      />
      {tank ? (
        <SelectField
          label="In service"
          name="tank-active"
          defaultValue={String(tank.active)}
          errors={errors['tank-active']}
          hint="A tank can go out of service only when it is empty."
        >
          <option value="true">In service</option>
          <option value="false">Out of service</option>
        </SelectField>
      ) : null}
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : tank ? 'Save tank' : 'Add tank'}</SubmitButton>
      </div>
    </form>
  );
}
