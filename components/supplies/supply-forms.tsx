'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, numberOf, useApiForm } from '@/components/forms/use-api-form';
import { apiClient, apiError } from '@/lib/api/client';
import { uploadFile } from '@/components/forms/upload-form';
import type { CHEMICAL_KINDS, QUANTITY_UNITS } from '@/lib/validation/brewing';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { SubmitButton } from '@/components/forms/submit-button';

const today = () => new Date().toISOString().slice(0, 10);

/** Records a chemical purchase, with an optional safety data sheet (PDF) uploaded after it. */
export function ChemicalLotForm({ slug, units: system = 'metric' }: { slug: string; units?: UnitSystem }) {
  const router = useRouter();
  const { busy, fields, message, send, setMessage } = useApiForm();
  const [kind, setKind] = useState('methanol');
  // The co-op's own units first: gallons and pounds in US co-ops, litres and kilograms otherwise.
  const us = system === 'us';
  const units =
    kind === 'methanol'
      ? us
        ? ['gal', 'L']
        : ['L', 'gal']
      : kind === 'other'
        ? us
          ? ['gal', 'L', 'lb', 'g', 'kg']
          : ['L', 'gal', 'g', 'kg', 'lb']
        : us
          ? ['lb', 'kg', 'g']
          : ['kg', 'g', 'lb'];
  const catalyst = kind === 'KOH' || kind === 'NaOH';

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = formObject(form);
    // The selects offer only the schema's choices.
    const body = {
      kind: f.kind as (typeof CHEMICAL_KINDS)[number],
      description: f.description,
      supplier: f.supplier ?? '',
      receivedOn: f.receivedOn ?? '',
      quantity: numberOf(f.quantity),
      unit: f.unit as (typeof QUANTITY_UNITS)[number],
      totalCost: f.totalCost ?? '',
      purityPct: numberOf(f.purityPct),
      notes: f.notes,
    };
    const path = { coop: slug };
    const lot = await send(
      (b) => apiClient.POST('/api/coops/{coop}/supplies/chemicals', { params: { path }, body: b }),
      { schema: 'chemicalLotCreateSchema', body },
      'Purchase recorded.',
    );
    if (!lot) return;
    const file = (form.elements.namedItem('sds') as HTMLInputElement | null)?.files?.[0];
    if (file) {
      const { response, error } = await uploadFile({ to: 'sds', coop: slug, lotId: lot.id }, file);
      if (!response.ok) {
        const e = apiError(error, response.status);
        setMessage({
          tone: 'danger',
          text: `The purchase was recorded, but the safety data sheet was not: ${(e.fields.file ?? [e.error])[0]}`,
        });
      }
    }
    form.reset();
    setKind('methanol');
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} noValidate className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3 [&>*]:min-w-0">
      {message ? (
        <div className="sm:col-span-2 lg:col-span-3">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <SelectField
        label="Chemical"
        name="kind"
        value={kind}
        onChange={(e) => setKind(e.target.value)}
        errors={fields.kind}
      >
        <option value="methanol">Methanol</option>
        <option value="KOH">KOH (potassium hydroxide)</option>
        <option value="NaOH">NaOH (sodium hydroxide)</option>
        <option value="other">Other</option>
      </SelectField>
      {kind === 'other' ? <TextField label="What it is" name="description" errors={fields.description} /> : null}
      <TextField label="Supplier" name="supplier" errors={fields.supplier} autoComplete="organization" />
      <TextField label="Received on" name="receivedOn" type="date" defaultValue={today()} errors={fields.receivedOn} />
      <div className="grid grid-cols-[minmax(0,1fr)_auto] gap-2">
        <TextField label="Quantity" name="quantity" inputMode="decimal" errors={fields.quantity} autoComplete="off" />
        <SelectField key={kind} label="Unit" name="unit" defaultValue={units[0]} errors={fields.unit}>
          {units.map((u) => (
            <option key={u} value={u}>
              {u}
            </option>
          ))}
        </SelectField>
      </div>
      <TextField
        label="Total cost ($)"
        name="totalCost"
        inputMode="decimal"
        placeholder="0.00"
        errors={fields.totalCost}
        autoComplete="off"
      />
      {catalyst ? (
        <TextField
          label="Purity (%)"
          name="purityPct"
          inputMode="decimal"
          errors={fields.purityPct}
          hint="From the label; KOH flake is usually about 90 %."
          autoComplete="off"
        />
      ) : null}
      <div className="flex flex-col gap-1">
        <label htmlFor="sds" className="text-sm font-medium text-stone-800">
          Safety data sheet (PDF, optional)
        </label>
        <input
          id="sds"
          name="sds"
          type="file"
          accept="application/pdf"
          className="min-h-11 w-full min-w-0 rounded-lg border border-stone-300 bg-white px-2 py-2 text-sm"
        />
      </div>
      <div className="sm:col-span-2 lg:col-span-3">
        <TextField label="Notes" name="notes" errors={fields.notes} />
      </div>
      <div className="sm:col-span-2 lg:col-span-3">
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Record purchase'}</SubmitButton>
      </div>
    </form>
  );
}

/** Records collected oil (volume in the co-op's units). */
export function OilLotForm({ slug, units }: { slug: string; units: UnitSystem }) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = formObject(form);
    const body = {
      collectedFrom: f.collectedFrom ?? '',
      collectedOn: f.collectedOn ?? '',
      volume: numberOf(f.volume),
      cost: f.cost,
      waterNotes: f.waterNotes,
      solidsNotes: f.solidsNotes,
      titrationMl: numberOf(f.titrationMl),
      titrant: f.titrant as 'KOH' | 'NaOH' | undefined,
    };
    const path = { coop: slug };
    if (
      await send(
        (b) => apiClient.POST('/api/coops/{coop}/supplies/oil', { params: { path }, body: b }),
        { schema: 'oilLotCreateSchema', body },
        'Oil lot recorded.',
      )
    ) {
      form.reset();
      router.refresh();
    }
  }
  return (
    <form onSubmit={onSubmit} noValidate className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3 [&>*]:min-w-0">
      {message ? (
        <div className="sm:col-span-2 lg:col-span-3">
          <Notice tone={message.tone}>{message.text}</Notice>
        </div>
      ) : null}
      <TextField label="Collected from" name="collectedFrom" errors={fields.collectedFrom} hint="Restaurant or place" />
      <TextField
        label="Collected on"
        name="collectedOn"
        type="date"
        defaultValue={today()}
        errors={fields.collectedOn}
      />
      <TextField
        label={`Volume (${volumeLabel(units)})`}
        name="volume"
        inputMode="decimal"
        errors={fields.volume}
        autoComplete="off"
      />
      <TextField
        label="Cost ($, often 0)"
        name="cost"
        inputMode="decimal"
        placeholder="0.00"
        errors={fields.cost}
        autoComplete="off"
      />
      <TextField
        label="Titration (mL, optional)"
        name="titrationMl"
        inputMode="decimal"
        errors={fields.titrationMl}
        hint="mL of 1 g/L solution per mL of oil"
        autoComplete="off"
      />
      <SelectField label="Titrant" name="titrant" defaultValue="" errors={fields.titrant}>
        <option value="">The co-op’s usual catalyst</option>
        <option value="KOH">KOH</option>
        <option value="NaOH">NaOH</option>
      </SelectField>
      <TextField label="Water notes" name="waterNotes" errors={fields.waterNotes} />
      <TextField label="Solids notes" name="solidsNotes" errors={fields.solidsNotes} />
      <div className="sm:col-span-2 lg:col-span-3">
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Record oil lot'}</SubmitButton>
      </div>
    </form>
  );
}
