'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { limitsFor, type FuelStandard } from '@/lib/quality';

interface Stored {
  test327?: { result: 'clear' | 'fallout'; falloutMl?: number };
  soap?: { hclMl: number; sampleGrams: number };
  washTest?: 'clean-split' | 'emulsion';
  water?: 'clear' | 'hazy';
}

/** Quick tests (screening) and lab results per property of the chosen standard. */
export function QualityForm({ url, quickTests, labResults, standard, readOnly }: {
  url: string; quickTests: Stored; labResults: Record<string, number>; standard: FuelStandard; readOnly?: boolean;
}) {
  const router = useRouter();
  const { busy, fields, message, submit } = useApiForm();
  const [std, setStd] = useState<FuelStandard>(standard);
  const rows = limitsFor(std).filter((r) => !r.reportOnly || r.property === 'cloudPoint');

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const d = new FormData(e.currentTarget);
    const s = (k: string) => String(d.get(k) ?? '').trim();
    const opt = (k: string) => (s(k) === '' ? undefined : s(k));
    const result327 = s('t327');
    const body = {
      qualityStandard: std,
      quickTests: {
        test327: result327 ? { result: result327, ...(opt('t327fallout') ? { falloutMl: opt('t327fallout') } : {}) } : null,
        soap: s('soapHcl') || s('soapGrams') ? { hclMl: opt('soapHcl'), sampleGrams: opt('soapGrams') } : null,
        washTest: s('washTest') || null,
        water: s('water') || null,
      },
      labResults: Object.fromEntries(rows.map((r) => [r.property, s(`lab-${r.property}`) || null])),
    };
    if (await submit(url, 'PATCH', body, 'Quality checks saved.')) router.refresh();
  }

  const f = (k: string) => fields[k];
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <fieldset className="flex flex-col gap-3" disabled={readOnly}>
        <legend className="mb-2 font-semibold text-fir-900">Home quick tests (screening)</legend>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          <SelectField label="3/27 methanol test" name="t327" defaultValue={quickTests.test327?.result ?? ''} errors={f('quickTests.test327.result')} hint="3 mL fuel in 27 mL methanol, shaken">
            <option value="">Not tested</option>
            <option value="clear">Clear</option>
            <option value="fallout">Fall-out</option>
          </SelectField>
          <TextField label="Fall-out (mL, if any)" name="t327fallout" inputMode="decimal" defaultValue={quickTests.test327?.falloutMl?.toString() ?? ''} errors={f('quickTests.test327.falloutMl')} />
          <TextField label="Soap test: 0.01 N HCl used (mL)" name="soapHcl" inputMode="decimal" defaultValue={quickTests.soap?.hclMl?.toString() ?? ''} errors={f('quickTests.soap.hclMl')} />
          <TextField label="Soap test: fuel sample (g)" name="soapGrams" inputMode="decimal" defaultValue={quickTests.soap?.sampleGrams?.toString() ?? ''} errors={f('quickTests.soap.sampleGrams')} />
          <SelectField label="Shake (wash) test" name="washTest" defaultValue={quickTests.washTest ?? ''} errors={f('quickTests.washTest')}>
            <option value="">Not tested</option>
            <option value="clean-split">Clean, quick split</option>
            <option value="emulsion">Emulsion</option>
          </SelectField>
          <SelectField label="Water (looking at the dried fuel)" name="water" defaultValue={quickTests.water ?? ''} errors={f('quickTests.water')}>
            <option value="">Not tested</option>
            <option value="clear">Clear</option>
            <option value="hazy">Hazy</option>
          </SelectField>
        </div>
      </fieldset>
      <fieldset className="flex flex-col gap-3" disabled={readOnly}>
        <legend className="mb-2 font-semibold text-fir-900">Lab results</legend>
        <SelectField label="Compare with" name="standard" value={std} onChange={(e) => setStd(e.target.value as FuelStandard)} errors={f('qualityStandard')}>
          <option value="ASTM D6751">ASTM D6751 (B100)</option>
          <option value="EN 14214">EN 14214</option>
        </SelectField>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {rows.map((r) => (
            <TextField
              key={`${std}-${r.property}`}
              label={`${r.label}${r.unit ? ` (${r.unit})` : ''}`}
              name={`lab-${r.property}`}
              inputMode="decimal"
              defaultValue={labResults[r.property]?.toString() ?? ''}
              hint={`Limit: ${r.limitText}`}
              errors={f(`labResults.${r.property}`)}
              autoComplete="off"
            />
          ))}
        </div>
      </fieldset>
      {readOnly ? null : <div><Button type="submit" disabled={busy}>{busy ? 'Saving…' : 'Save quality checks'}</Button></div>}
    </form>
  );
}
