'use client';

import { useRouter } from 'next/navigation';
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

/** Moves available fuel between two tanks; value moves with it at average cost. */
export function TransferForm({
  coopSlug,
  units,
  tanks,
}: {
  coopSlug: string;
  units: UnitSystem;
  tanks: { id: number; name: string }[];
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const { busy, fields, message, send } = useApiForm();
  const errors = prefixedErrors(fields, 'xfer');
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = prefixedObject(form, 'xfer');
    const body = { fromTankId: f.fromTankId, toTankId: f.toTankId, quantity: f.quantity ?? '', reason: f.reason };
    const ok = await send(
      (b) => apiClient.POST('/api/coops/{coop}/tanks/transfers', { params: { path: { coop: coopSlug } }, body: b }),
      { schema: 'transferCreateSchema', body },
      'Moved. Both tanks’ ledgers show the transfer.',
    );
    if (ok) {
      form.reset();
      await mutate(tanksKey(coopSlug));
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Move fuel between tanks" className="grid gap-4 sm:grid-cols-2">
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <SelectField label="From" name="xfer-fromTankId" defaultValue={tanks[0]?.id} errors={errors['xfer-fromTankId']}>
        {tanks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </SelectField>
      <SelectField label="Into" name="xfer-toTankId" defaultValue={tanks[1]?.id} errors={errors['xfer-toTankId']}>
        {tanks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </SelectField>
      <TextField
        label={`Quantity (${unitWord(units)})`}
        name="xfer-quantity"
        inputMode="decimal"
        autoComplete="off"
        required
        errors={errors['xfer-quantity']}
      />
      <TextField label="Note (optional)" name="xfer-reason" errors={errors['xfer-reason']} />
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Moving…' : 'Move fuel'}</SubmitButton>
      </div>
    </form>
  );
}
