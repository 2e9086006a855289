import { Card, Notice } from '@/components/ui/notice';
import type { BatchDto } from '@/lib/brewing';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { Figure } from './figure';
import { dateText, fieldNumber, fieldVolume, grams, vol } from './format';
import { SafetyNote } from './safety-note';
import { StepForm, type StepField } from './step-form';

/** Step 1 of the batch record: the plan's figures and how they were worked out; while planned, a form to change it. */
export function BatchPlan({
  batch,
  units,
  url,
  altitude,
}: {
  batch: BatchDto;
  units: UnitSystem;
  url: string;
  altitude: string | null;
}) {
  const { plan } = batch;
  const planned = batch.status === 'planned';
  const v = volumeLabel(units);
  const methanolPlanned = vol(batch.computedMethanolLiters, units, 2);

  const planFields: StepField[] = [
    {
      name: 'oilVolume',
      label: `Oil (${v})`,
      kind: 'number',
      defaultValue: fieldVolume(batch.oilLiters, units),
      omitEmpty: true,
    },
    {
      name: 'titrationTrials',
      label: 'Titration trials (mL)',
      kind: 'list',
      defaultValue: plan.titration.trials.join(', '),
      omitEmpty: true,
      hint: 'Separate trials with commas, e.g. 4.9, 5.1, 5.2',
    },
    {
      name: 'titrant',
      label: 'Titrant the trials used',
      kind: 'select',
      defaultValue: plan.titration.titrant,
      omitEmpty: true,
      options: [
        { value: 'KOH', label: 'KOH solution' },
        { value: 'NaOH', label: 'NaOH solution' },
      ],
    },
    {
      name: 'titrantFrom',
      label: 'Titrant made from',
      kind: 'select',
      defaultValue: plan.titrantFrom,
      omitEmpty: true,
      options: [
        { value: 'same-catalyst', label: 'The batch’s own catalyst stock' },
        { value: 'pure-reagent', label: 'Pure (reagent-grade) catalyst' },
      ],
      hint: 'A titrant of the other chemical is always treated as pure reagent.',
    },
    {
      name: 'catalyst',
      label: 'Catalyst',
      kind: 'select',
      defaultValue: plan.catalyst,
      omitEmpty: true,
      options: [
        { value: 'KOH', label: 'KOH' },
        { value: 'NaOH', label: 'NaOH' },
      ],
    },
    { name: 'purityPct', label: 'Purity (%)', kind: 'number', defaultValue: String(plan.purityPct), omitEmpty: true },
    {
      name: 'baseGramsPerLiter',
      label: 'Base amount (g per L of oil, pure)',
      kind: 'number',
      defaultValue: fieldNumber(plan.baseGramsPerLiter, 3),
      omitEmpty: true,
    },
    {
      name: 'methanolPct',
      label: 'Methanol (% of oil volume)',
      kind: 'number',
      defaultValue: plan.methanol.pct === null ? '' : String(plan.methanol.pct),
      omitEmpty: true,
    },
  ];

  return (
    <Card title="1. Plan" id="step-plan">
      <dl className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <Figure
          label="Oil"
          value={vol(batch.oilLiters, units)}
          sub={units === 'us' ? `${batch.oilLiters.toFixed(1)} L` : undefined}
        />
        <Figure
          label="Titration average"
          value={`${plan.titration.averageMl.toFixed(2)} mL`}
          sub={`${plan.titration.source === 'oil-lot' ? 'From the oil lot' : 'Trials'}: ${plan.titration.trials.join(', ')} mL (${plan.titration.titrant})`}
        />
        <Figure
          label={`${plan.catalyst} to weigh`}
          value={grams(batch.computedCatalystGrams)}
          sub={`${plan.catalystResult.gramsPerLiter.toFixed(2)} g/L at ${plan.purityPct} % purity`}
        />
        <Figure
          label="Methanol"
          value={methanolPlanned}
          sub={
            plan.methanol.mode === 'percent'
              ? `${plan.methanol.pct} % of oil (≈ ${plan.methanol.equivalentMolarRatio.toFixed(1)}:1 molar)`
              : `${plan.methanol.molarRatio}:1 molar (${plan.methanol.equivalentPct.toFixed(1)} % of oil)`
          }
        />
      </dl>
      <p className="mt-3 text-sm text-stone-700">
        <span className="font-semibold">How the catalyst was worked out:</span> {plan.catalystResult.explanation}
      </p>
      <p className="mt-1 text-sm text-stone-700">
        Oil acidity: acid number {plan.oil.acidNumber.toFixed(2)} mg KOH/g, free fatty acids{' '}
        {plan.oil.ffaPercent.toFixed(2)} % (as oleic acid). Expected: about {vol(plan.projectedFuelLiters, units)} of
        fuel ({plan.yieldProjection.explanation.replace(/\.$/, '')}); a crude glycerin layer of about{' '}
        {vol(plan.yields.crudeGlycerinLiters, units)} ({vol(plan.yields.crudeGlycerinRangeLiters[0], units)}–
        {vol(plan.yields.crudeGlycerinRangeLiters[1], units)}) holding about {vol(plan.yields.glycerolLiters, units)} of
        pure glycerol.
      </p>
      {plan.oil.needsAcidPretreatment ? (
        <div className="mt-2">
          <Notice tone="warn">{plan.oil.message}</Notice>
        </div>
      ) : null}
      {plan.titration.notice ? (
        <div className="mt-2">
          <Notice tone="warn">{plan.titration.notice}</Notice>
        </div>
      ) : null}
      {batch.oilLots.length ? (
        <p className="mt-2 text-sm">
          Oil lots:{' '}
          {batch.oilLots
            .map((o) => `${vol(o.liters, units)} from ${o.collectedFrom} (${dateText(o.collectedOn)})`)
            .join('; ')}
          .
        </p>
      ) : (
        <p className="mt-2 text-sm text-stone-600">No oil lots linked to this batch.</p>
      )}
      {planned ? (
        <details className="mt-3 rounded-lg border border-stone-200 p-3">
          <summary className="cursor-pointer font-semibold text-fir-800">Change the plan</summary>
          <div className="mt-3">
            <StepForm url={url} fields={planFields} submitLabel="Recompute and save" okText="Plan updated." />
          </div>
        </details>
      ) : null}
      <div className="mt-3">
        <SafetyNote
          topics={['methanol', 'lye', 'materials', 'protective-equipment']}
          title="Before handling methanol and lye"
          altitude={altitude}
        />
      </div>
    </Card>
  );
}
