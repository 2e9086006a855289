'use client';

import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, numberOf, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import type { CoopSettingsDto } from '@/lib/coops/settings-types';
import { SubmitButton } from '@/components/forms/submit-button';

export function SettingsForm({ initial }: { initial: CoopSettingsDto }) {
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = formObject(e.currentTarget);
    // The selects offer only the schema's choices; the check below names anything else.
    const body = {
      name: f.name ?? '',
      units: f.units as 'us' | 'metric',
      timezone: f.timezone ?? '',
      monthlyDues: f.monthlyDues ?? '',
      selfServeDraws: f.selfServeDraws === 'on',
      catalyst: f.catalyst as 'KOH' | 'NaOH',
      baseGramsPerLiter: Number(f.baseGramsPerLiter ?? ''),
      purityPct: Number(f.purityPct ?? ''),
      methanolPct: Number(f.methanolPct ?? ''),
      qualityStandard: f.qualityStandard as 'ASTM D6751' | 'EN 14214',
      elevation: numberOf(f.elevation),
    };
    const path = { coop: initial.slug };
    if (
      await send(
        (b) => apiClient.PUT('/api/coops/{coop}/settings', { params: { path }, body: b }),
        { schema: 'coopSettingsUpdateSchema', body },
        'Settings saved.',
      )
    )
      window.location.reload();
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <fieldset className="grid gap-4 rounded-xl border border-stone-200 bg-white p-4 sm:grid-cols-2">
        <legend className="px-1 font-semibold text-fir-900">Co-op</legend>
        <TextField label="Name" name="name" defaultValue={initial.name} errors={fields.name} />
        <SelectField
          label="Units"
          name="units"
          defaultValue={initial.units}
          errors={fields.units}
          hint="Changes how volumes and temperatures are shown; stored figures do not change."
        >
          <option value="us">US gallons and °F</option>
          <option value="metric">Litres and °C</option>
        </SelectField>
        <TextField
          label="Time zone"
          name="timezone"
          defaultValue={initial.timezone}
          errors={fields.timezone}
          hint="Months and quarters follow this zone."
        />
        <TextField
          label={`Monthly dues (${initial.currency})`}
          name="monthlyDues"
          inputMode="decimal"
          defaultValue={(initial.monthlyDuesCents / 100).toFixed(2)}
          errors={fields.monthlyDues}
        />
        <div className="flex items-center gap-3 sm:col-span-2">
          <input
            id="selfServeDraws"
            name="selfServeDraws"
            type="checkbox"
            defaultChecked={initial.selfServeDraws}
            className="h-5 w-5 accent-fir-700"
          />
          <label htmlFor="selfServeDraws" className="text-sm">
            Members may record their own draws at a self-serve pump
          </label>
        </div>
      </fieldset>
      <fieldset className="grid gap-4 rounded-xl border border-stone-200 bg-white p-4 sm:grid-cols-2">
        <legend className="px-1 font-semibold text-fir-900">Recipe defaults for the planner</legend>
        <SelectField label="Catalyst" name="catalyst" defaultValue={initial.catalyst} errors={fields.catalyst}>
          <option value="NaOH">NaOH (sodium hydroxide)</option>
          <option value="KOH">KOH (potassium hydroxide)</option>
        </SelectField>
        <TextField
          label="Base amount (g per litre of oil, as pure catalyst)"
          name="baseGramsPerLiter"
          inputMode="decimal"
          defaultValue={String(initial.baseGramsPerLiter)}
          errors={fields.baseGramsPerLiter}
          hint="Common practice: NaOH 3.5 g/L; KOH 4.91 g/L pure equivalent."
        />
        <TextField
          label="Catalyst purity (%)"
          name="purityPct"
          inputMode="decimal"
          defaultValue={String(initial.purityPct)}
          errors={fields.purityPct}
          hint="Flake KOH is often about 90 %; NaOH 97–99 % (common practice)."
        />
        <TextField
          label="Methanol (% of oil volume)"
          name="methanolPct"
          inputMode="decimal"
          defaultValue={String(initial.methanolPct)}
          errors={fields.methanolPct}
          hint="20 % is common practice."
        />
        <SelectField
          label="Fuel-quality standard"
          name="qualityStandard"
          defaultValue={initial.qualityStandard}
          errors={fields.qualityStandard}
        >
          <option value="ASTM D6751">ASTM D6751 (North America)</option>
          <option value="EN 14214">EN 14214 (Europe)</option>
        </SelectField>
        <TextField
          label={`Elevation of the brewing site (${initial.units === 'us' ? 'feet' : 'metres'} above sea level)`}
          name="elevation"
          inputMode="decimal"
          defaultValue={String(Math.round(initial.units === 'us' ? initial.elevationM / 0.3048 : initial.elevationM))}
          errors={fields.elevation}
          hint="Methanol boils lower at altitude (about 60 °C / 140 °F at 1,600 m / 5,250 ft): the temperature warnings use it."
        />
      </fieldset>
      <div>
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Save settings'}</SubmitButton>
      </div>
    </form>
  );
}
