'use client';

import { useRouter } from 'next/navigation';
import { useEffect, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { FieldErrors, SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { callApi, numberOf } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import type { PlannerResultDto as PlannerResult } from '@/lib/api/dto/brewing';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { PlanResult } from './plan-result';
import { SubmitButton } from '@/components/forms/submit-button';

export interface PlannerOilLot {
  id: number;
  label: string;
  remainingLiters: number;
  titrationMl: number | null;
  titrant: string | null;
}
interface Recipe {
  catalyst: 'KOH' | 'NaOH';
  baseGramsPerLiter: number | null;
  purityPct: number | null;
  methanolPct: number | null;
}

const TRIALS = ['trial1', 'trial2', 'trial3', 'trial4'];

/**
 * The batch planner: inputs on the left, the computed figures beside them (recomputed by the
 * planner route as you type), then "Create batch" to start a batch record in status planned.
 */
export function PlannerForm({
  slug,
  units,
  currency,
  recipe,
  oilLots,
}: {
  slug: string;
  units: UnitSystem;
  currency: string;
  recipe: Recipe;
  oilLots: PlannerOilLot[];
}) {
  const router = useRouter();
  const formRef = useRef<HTMLFormElement>(null);
  const [result, setResult] = useState<PlannerResult | null>(null);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [computing, setComputing] = useState(false);
  const [creating, setCreating] = useState(false);
  const [mode, setMode] = useState<'percent' | 'molar-ratio'>('percent');
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const seq = useRef(0);

  /** The inputs as the planner's body; `batchCreateSchema` takes the same without the energy figures. */
  function body() {
    const d = new FormData(formRef.current!);
    const s = (k: string) => String(d.get(k) ?? '').trim() || undefined;
    const trials = TRIALS.map(s)
      .filter((t): t is string => t !== undefined)
      .map(Number);
    // The selects offer only the schema's choices.
    return {
      oilVolume: numberOf(s('oilVolume')),
      oilLotId: s('oilLotId'),
      catalyst: s('catalyst') as 'KOH' | 'NaOH' | undefined,
      baseGramsPerLiter: numberOf(s('baseGramsPerLiter')),
      purityPct: numberOf(s('purityPct')),
      titrant: s('titrant') as 'KOH' | 'NaOH' | undefined,
      titrantFrom: s('titrantFrom') as 'same-catalyst' | 'pure-reagent' | undefined,
      titrationBlankMl: numberOf(s('titrationBlankMl')),
      methanolMode: s('methanolMode') as 'percent' | 'molar-ratio' | undefined,
      methanolPct: mode === 'percent' ? numberOf(s('methanolPct')) : undefined,
      molarRatio: mode === 'molar-ratio' ? numberOf(s('molarRatio')) : undefined,
      titrationTrials: trials.length ? trials : undefined,
    };
  }

  async function compute() {
    const d = new FormData(formRef.current!);
    const n = (k: string) => numberOf(String(d.get(k) ?? ''));
    const b = {
      ...body(),
      tariffCentsPerKwh: n('tariffCentsPerKwh'),
      heaterKw: n('heaterKw'),
      heaterHours: n('heaterHours'),
      startTemp: n('startTemp'),
    };
    if (b.oilVolume === undefined || (!b.titrationTrials && !b.oilLotId)) {
      setResult(null);
      return;
    }
    const mine = ++seq.current;
    setComputing(true);
    const r = await callApi(
      (x) => apiClient.POST('/api/coops/{coop}/planner', { params: { path: { coop: slug } }, body: x }),
      { schema: 'plannerSchema', body: b },
    );
    if (mine !== seq.current) return;
    setComputing(false);
    if (r.ok) {
      // openapi-fetch widens the yields' [low, high] tuple to an array; every other field is the contract's.
      setResult(r.data as PlannerResult);
      setErrors({});
      setMessage(null);
    } else {
      setErrors(r.fields);
      setMessage(r.error);
    }
  }

  function schedule() {
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(compute, 450);
  }
  useEffect(
    () => () => {
      if (timer.current) clearTimeout(timer.current);
    },
    [],
  );

  async function create() {
    setCreating(true);
    const r = await callApi(
      (b) => apiClient.POST('/api/coops/{coop}/batches', { params: { path: { coop: slug } }, body: b }),
      { schema: 'batchCreateSchema', body: body() },
    );
    setCreating(false);
    if (r.ok) router.push(`/c/${slug}/batches/${r.data.id}`);
    else {
      setErrors(r.fields);
      setMessage(r.error);
    }
  }

  const v = volumeLabel(units);
  const trialErrors = Object.entries(errors)
    .filter(([k]) => k.startsWith('titrationTrials'))
    .flatMap(([, e]) => e);
  return (
    <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.1fr)]">
      <form
        ref={formRef}
        noValidate
        onChange={schedule}
        onSubmit={(e) => {
          e.preventDefault();
          compute();
        }}
        className="flex min-w-0 flex-col gap-4 rounded-xl border border-stone-200 bg-white p-4 shadow-sm"
      >
        <h2>Oil and titration</h2>
        <TextField
          label={`Oil volume (${v})`}
          name="oilVolume"
          inputMode="decimal"
          errors={errors.oilVolume}
          autoComplete="off"
        />
        <div className="flex min-w-0 flex-col gap-1">
          <label htmlFor="oilLotId" className="text-sm font-medium text-stone-800">
            Oil lot (optional)
          </label>
          <select
            id="oilLotId"
            name="oilLotId"
            defaultValue=""
            aria-describedby={errors.oilLotId ? 'oilLotId-hint oilLotId-error' : 'oilLotId-hint'}
            aria-invalid={errors.oilLotId ? true : undefined}
            className={`min-h-11 w-full min-w-0 rounded-lg border bg-white px-3 py-2 text-base ${errors.oilLotId ? 'border-danger-600' : 'border-stone-300'}`}
          >
            <option value="">None</option>
            {oilLots.map((o) => (
              <option key={o.id} value={o.id}>
                {o.label}
              </option>
            ))}
          </select>
          <p id="oilLotId-hint" className="text-xs text-stone-600">
            Its titration is used when you type no trials, and its cost counts as feedstock.
          </p>
          <FieldErrors id="oilLotId-error" errors={errors.oilLotId} />
        </div>
        <fieldset>
          <legend className="text-sm font-medium text-stone-800">
            Titration trials (mL of 1 g/L solution per mL of oil)
          </legend>
          <div className="mt-1 grid grid-cols-2 gap-2 sm:grid-cols-4">
            {TRIALS.map((t, i) => (
              <div key={t} className="flex flex-col gap-1">
                <label htmlFor={t} className="text-xs text-stone-700">
                  Trial {i + 1}
                </label>
                <input
                  id={t}
                  name={t}
                  inputMode="decimal"
                  autoComplete="off"
                  aria-invalid={trialErrors.length ? true : undefined}
                  aria-describedby={trialErrors.length ? 'trials-error' : undefined}
                  className={`min-h-11 w-full rounded-lg border bg-white px-3 py-2 text-base ${trialErrors.length ? 'border-danger-600' : 'border-stone-300'}`}
                />
              </div>
            ))}
          </div>
          {trialErrors.length ? (
            <p id="trials-error" role="alert" className="mt-1 text-sm font-medium text-danger-700">
              {trialErrors.join(' ')}
            </p>
          ) : null}
        </fieldset>
        <TextField
          label="Blank (mL, optional)"
          name="titrationBlankMl"
          inputMode="decimal"
          errors={errors.titrationBlankMl}
          hint="Titrant used by the alcohol alone."
          autoComplete="off"
        />

        <h2 className="mt-2">Recipe</h2>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          <SelectField label="Catalyst" name="catalyst" defaultValue={recipe.catalyst} errors={errors.catalyst}>
            <option value="KOH">KOH (potassium hydroxide)</option>
            <option value="NaOH">NaOH (sodium hydroxide)</option>
          </SelectField>
          <TextField
            label="Purity (%)"
            name="purityPct"
            inputMode="decimal"
            errors={errors.purityPct}
            placeholder={recipe.purityPct ? String(recipe.purityPct) : ''}
            hint="Leave empty to use the lot in stock."
            autoComplete="off"
          />
          <TextField
            label="Base amount (g/L, pure)"
            name="baseGramsPerLiter"
            inputMode="decimal"
            errors={errors.baseGramsPerLiter}
            placeholder={recipe.baseGramsPerLiter ? String(recipe.baseGramsPerLiter) : ''}
            hint="Leave empty for the co-op’s recipe."
            autoComplete="off"
          />
          <SelectField
            label="Titrant the trials used"
            name="titrant"
            defaultValue=""
            errors={errors.titrant}
            hint="An oil lot's titration names its own titrant."
          >
            <option value="">Same chemical as the catalyst</option>
            <option value="KOH">KOH solution</option>
            <option value="NaOH">NaOH solution</option>
          </SelectField>
          <SelectField
            label="Titrant made from"
            name="titrantFrom"
            defaultValue=""
            errors={errors.titrantFrom}
            hint="By default the batch’s own catalyst stock when the titrant is the same chemical, else pure reagent."
          >
            <option value="">Default</option>
            <option value="same-catalyst">The batch’s own catalyst stock</option>
            <option value="pure-reagent">Pure (reagent-grade) catalyst</option>
          </SelectField>
          <SelectField
            label="Methanol by"
            name="methanolMode"
            value={mode}
            onChange={(e) => setMode(e.target.value as 'percent' | 'molar-ratio')}
            errors={errors.methanolMode}
          >
            <option value="percent">% of oil volume</option>
            <option value="molar-ratio">Molar ratio</option>
          </SelectField>
          {mode === 'percent' ? (
            <TextField
              key="pct"
              label="Methanol (% of oil)"
              name="methanolPct"
              inputMode="decimal"
              errors={errors.methanolPct}
              placeholder={String(recipe.methanolPct ?? 20)}
              autoComplete="off"
            />
          ) : (
            <TextField
              key="ratio"
              label="Molar ratio (methanol : oil)"
              name="molarRatio"
              inputMode="decimal"
              errors={errors.molarRatio}
              placeholder="6"
              autoComplete="off"
            />
          )}
        </div>
        <details className="rounded-lg border border-stone-200 p-3">
          <summary className="cursor-pointer text-sm font-semibold text-fir-800">
            Energy (optional, for the cost)
          </summary>
          <div className="mt-3 grid gap-3 sm:grid-cols-3">
            <TextField
              label="Tariff (¢/kWh)"
              name="tariffCentsPerKwh"
              inputMode="decimal"
              errors={errors.tariffCentsPerKwh}
              autoComplete="off"
            />
            <TextField
              label="Heater (kW)"
              name="heaterKw"
              inputMode="decimal"
              errors={errors.heaterKw}
              autoComplete="off"
            />
            <TextField
              label="Hours"
              name="heaterHours"
              inputMode="decimal"
              errors={errors.heaterHours}
              autoComplete="off"
            />
            <TextField
              label={`Oil start temperature (${units === 'us' ? '°F' : '°C'})`}
              name="startTemp"
              inputMode="decimal"
              errors={errors.startTemp}
              hint="For the heating estimate when no heater figures are given."
              autoComplete="off"
            />
          </div>
        </details>
        <div className="flex flex-wrap gap-3">
          <SubmitButton variant="secondary" disabled={computing}>
            {computing ? 'Working it out…' : 'Work it out'}
          </SubmitButton>
          <Button type="button" disabled={!result || creating} onClick={create}>
            {creating ? 'Creating…' : 'Create batch'}
          </Button>
        </div>
      </form>

      <section aria-live="polite" aria-label="Plan" className="flex min-w-0 flex-col gap-4">
        {message ? <Notice tone="danger">{message}</Notice> : null}
        {!result ? (
          <div className="rounded-xl border border-dashed border-stone-300 bg-white p-6 text-sm text-stone-600">
            Type the oil volume and at least one titration trial (or choose an oil lot with a titration): the catalyst,
            methanol, stock check and cost appear here.
          </div>
        ) : (
          <PlanResult r={result} units={units} currency={currency} />
        )}
      </section>
    </div>
  );
}
