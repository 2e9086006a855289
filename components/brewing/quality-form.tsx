'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { HOME_TEST_LABORATORY, limitsFor, type FuelStandard, type QualityResults } from '@/lib/quality';
import { stepTarget } from './step-targets';
import { useUnsavedForm } from './unsaved';
import { SubmitButton } from '@/components/forms/submit-button';

interface Stored {
  test327?: { result: 'clear' | 'fallout'; falloutMl?: number };
  soap?: { hclMl: number; sampleGrams: number };
  washTest?: 'clean-split' | 'emulsion';
  water?: 'clear' | 'hazy';
}

/** Quick tests (screening) and lab results per property of the chosen standard. */
export function QualityForm({
  url,
  quickTests,
  labResults,
  standard,
  readOnly,
}: {
  url: string;
  quickTests: Stored;
  labResults: QualityResults;
  standard: FuelStandard;
  readOnly?: boolean;
}) {
  const stored = (k: string) => labResults[k as keyof QualityResults];
  const valueOf = (k: string) => {
    const v = stored(k);
    return v === undefined || v === null ? '' : String(typeof v === 'number' ? v : v.value);
  };
  const metaOf = (k: string) => {
    const v = stored(k);
    return v !== undefined && v !== null && typeof v === 'object' ? v : null;
  };
  const firstMeta =
    Object.keys(labResults)
      .map(metaOf)
      .find((m) => m !== null) ?? null;
  const router = useRouter();
  const { busy, fields, message, send, setMessage } = useApiForm();
  const [std, setStd] = useState<FuelStandard>(standard);
  const rows = limitsFor(std).filter((r) => !r.reportOnly || r.property === 'cloudPoint');
  // Typed results are registered so that moving the batch on (or releasing it) saves them first; leaving the page asks.
  const { formRef, dirty, onChange, onSubmit } = useUnsavedForm(save);

  async function save(form: HTMLFormElement): Promise<boolean> {
    const d = new FormData(form);
    const s = (k: string) => String(d.get(k) ?? '').trim();
    const opt = (k: string) => (s(k) === '' ? undefined : s(k));
    const result327 = s('t327');
    const body = {
      qualityStandard: std,
      quickTests: {
        test327: result327
          ? { result: result327, ...(opt('t327fallout') ? { falloutMl: opt('t327fallout') } : {}) }
          : null,
        soap: s('soapHcl') || s('soapGrams') ? { hclMl: opt('soapHcl'), sampleGrams: opt('soapGrams') } : null,
        washTest: s('washTest') || null,
        water: s('water') || null,
      },
      labResults: Object.fromEntries(
        rows.map((r) => {
          const value = s(`lab-${r.property}`);
          if (!value) return [r.property, null];
          const laboratory = s('labName');
          const date = s('labDate');
          const method = s(`method-${r.property}`) || r.method;
          // With a laboratory (or "home test") and a date the result keeps its provenance; a bare value is screening only.
          return [r.property, laboratory && date ? { value, method, laboratory, date } : value];
        }),
      ),
    };
    const target = stepTarget(url, 'PATCH');
    if (!target) {
      setMessage({ tone: 'danger', text: 'This form has nowhere to save to.' });
      return false;
    }
    const ok = Boolean(await send(target.call, { schema: target.schema, body }, 'Quality checks saved.'));
    if (ok) router.refresh();
    return ok;
  }

  const f = (k: string) => fields[k];
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <fieldset className="flex flex-col gap-3" disabled={readOnly}>
        <legend className="mb-2 font-semibold text-fir-900">Home quick tests (screening)</legend>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          <SelectField
            label="3/27 methanol test"
            name="t327"
            defaultValue={quickTests.test327?.result ?? ''}
            errors={f('quickTests.test327.result')}
            hint="3 mL fuel in 27 mL methanol, shaken"
          >
            <option value="">Not tested</option>
            <option value="clear">Clear</option>
            <option value="fallout">Fall-out</option>
          </SelectField>
          <TextField
            label="Fall-out (mL, if any)"
            name="t327fallout"
            inputMode="decimal"
            defaultValue={quickTests.test327?.falloutMl?.toString() ?? ''}
            errors={f('quickTests.test327.falloutMl')}
          />
          <TextField
            label="Soap test: 0.01 N HCl used (mL)"
            name="soapHcl"
            inputMode="decimal"
            defaultValue={quickTests.soap?.hclMl?.toString() ?? ''}
            errors={f('quickTests.soap.hclMl')}
          />
          <TextField
            label="Soap test: fuel sample (g)"
            name="soapGrams"
            inputMode="decimal"
            defaultValue={quickTests.soap?.sampleGrams?.toString() ?? ''}
            errors={f('quickTests.soap.sampleGrams')}
          />
          <SelectField
            label="Shake (wash) test"
            name="washTest"
            defaultValue={quickTests.washTest ?? ''}
            errors={f('quickTests.washTest')}
          >
            <option value="">Not tested</option>
            <option value="clean-split">Clean, quick split</option>
            <option value="emulsion">Emulsion</option>
          </SelectField>
          <SelectField
            label="Water (looking at the dried fuel)"
            name="water"
            defaultValue={quickTests.water ?? ''}
            errors={f('quickTests.water')}
          >
            <option value="">Not tested</option>
            <option value="clear">Clear</option>
            <option value="hazy">Hazy</option>
          </SelectField>
        </div>
      </fieldset>
      <fieldset className="flex flex-col gap-3" disabled={readOnly}>
        <legend className="mb-2 font-semibold text-fir-900">Lab results</legend>
        <SelectField
          label="Compare with"
          name="standard"
          value={std}
          onChange={(e) => setStd(e.target.value as FuelStandard)}
          errors={f('qualityStandard')}
        >
          <option value="ASTM D6751">ASTM D6751 (B100)</option>
          <option value="EN 14214">EN 14214</option>
        </SelectField>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          <TextField
            label="Laboratory"
            name="labName"
            defaultValue={firstMeta?.laboratory ?? ''}
            hint={`The lab's name, or "${HOME_TEST_LABORATORY}" for your own measurements (those never earn a standard verdict).`}
            errors={f('labResults')}
            autoComplete="off"
          />
          <TextField label="Date tested" name="labDate" type="date" defaultValue={firstMeta?.date ?? ''} />
        </div>
        <p className="text-xs text-stone-600">
          Only results with a laboratory, a method and a date count toward {std}: the batch meets it only when every
          required property has a laboratory result within its limit.
        </p>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {rows.map((r) => (
            <div key={`${std}-${r.property}`} className="flex flex-col gap-1">
              <TextField
                label={`${r.label}${r.unit ? ` (${r.unit})` : ''}`}
                name={`lab-${r.property}`}
                inputMode="decimal"
                defaultValue={valueOf(r.property)}
                hint={`Limit: ${r.limitText}${r.required ? '' : ' (not required)'}`}
                errors={f(`labResults.${r.property}`) ?? f(`labResults.${r.property}.value`)}
                autoComplete="off"
              />
              <TextField
                label={`Method for ${r.label.charAt(0).toLowerCase()}${r.label.slice(1)}`}
                name={`method-${r.property}`}
                defaultValue={metaOf(r.property)?.method ?? r.method}
                errors={f(`labResults.${r.property}.method`)}
                autoComplete="off"
              />
            </div>
          ))}
        </div>
      </fieldset>
      {readOnly ? null : (
        <div className="flex items-center gap-3">
          <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Save quality checks'}</SubmitButton>
          {dirty ? <span className="text-xs text-stone-600">Unsaved changes</span> : null}
        </div>
      )}
    </form>
  );
}
