'use client';

import { useRouter } from 'next/navigation';
import { useSWRConfig } from 'swr';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { formatMl, unitWord } from '@/lib/tank/volume';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { prefixedErrors, prefixedObject } from './form-utils';
import { tanksKey } from './live-tanks';
import { SubmitButton } from '@/components/forms/submit-button';

/** A brewer enters the measured volume; any difference from the book becomes a ledger row with its reason. */
export function DipForm({
  coopSlug,
  units,
  tanks,
  currency,
}: {
  coopSlug: string;
  units: UnitSystem;
  tanks: { id: number; name: string }[];
  currency: string;
}) {
  const router = useRouter();
  const { mutate } = useSWRConfig();
  const { busy, fields, message, send, setMessage } = useApiForm();
  const errors = prefixedErrors(fields, 'dip');
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = prefixedObject(form, 'dip');
    const path = { coop: coopSlug, tankId: f.tankId ?? '' };
    const body = { measured: f.measured ?? '', reason: f.reason, unitCost: f.unitCost };
    const r = await send(
      (b) => apiClient.POST('/api/coops/{coop}/tanks/{tankId}/dips', { params: { path }, body: b }),
      { schema: 'dipCreateSchema', body },
    );
    if (r) {
      const d = Math.round(r.differenceLiters * 1000);
      setMessage({
        tone: 'ok',
        text:
          d === 0
            ? 'Recorded: the reading matches the book.'
            : `Recorded: ${formatMl(d, units, { signed: true, digits: 2 })} adjustment in the ledger.`,
      });
      form.reset();
      await mutate(tanksKey(coopSlug));
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Record a dip reading" className="grid gap-4 sm:grid-cols-2">
      {message ? (
        <div className="sm:col-span-2">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <SelectField label="Tank" name="dip-tankId" errors={errors['dip-tankId']}>
        {tanks.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </SelectField>
      <TextField
        label={`Measured volume (${unitWord(units)})`}
        name="dip-measured"
        inputMode="decimal"
        autoComplete="off"
        required
        errors={errors['dip-measured']}
      />
      <TextField
        label="Reason for any difference"
        name="dip-reason"
        errors={errors['dip-reason']}
        hint="e.g. evaporation, a spill, meter drift, opening balance"
      />
      <TextField
        label={`Value of a gain (${currency} per ${volumeLabel(units)}, optional)`}
        name="dip-unitCost"
        inputMode="decimal"
        autoComplete="off"
        errors={errors['dip-unitCost']}
        hint="Leave empty to value it at the tank’s average cost."
      />
      <div className="sm:col-span-2">
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Record dip reading'}</SubmitButton>
      </div>
    </form>
  );
}
