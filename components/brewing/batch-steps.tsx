import { Card } from '@/components/ui/notice';
import type { BatchDto } from '@/lib/brewing';
import { volumeLabel, type UnitSystem } from '@/lib/units';
import { fieldNumber, fieldVolume, grams, vol } from './format';
import { SafetyNote } from './safety-note';
import { StepForm, type StepField } from './step-form';
import { TemperatureLog } from './temperature-log';

/** Steps 2–5 of the batch record: reaction (with the temperature log), settling and draining, washing, drying. */
export function BatchSteps({
  batch,
  units,
  url,
  final,
  timeZone,
  altitude,
  elevationM,
}: {
  batch: BatchDto;
  url: string;
  units: UnitSystem;
  final: boolean;
  timeZone: string;
  altitude: string | null;
  elevationM: number;
}) {
  const { plan } = batch;
  const v = volumeLabel(units);
  const methanolPlanned = vol(batch.computedMethanolLiters, units, 2);

  const reactionFields: StepField[] = [
    {
      name: 'actualCatalystGrams',
      label: `${plan.catalyst} weighed out (g)`,
      kind: 'number',
      defaultValue: fieldNumber(batch.actualCatalystGrams, 1),
      aside: (
        <>
          Planned: <strong>{grams(batch.computedCatalystGrams)}</strong>
        </>
      ),
    },
    {
      name: 'actualMethanol',
      label: `Methanol measured (${v})`,
      kind: 'number',
      defaultValue: fieldVolume(batch.actualMethanolLiters, units),
      aside: (
        <>
          Planned: <strong>{methanolPlanned}</strong>
        </>
      ),
    },
    {
      name: 'mixingMinutes',
      label: 'Mixing time (minutes)',
      kind: 'number',
      defaultValue: batch.mixingMinutes?.toString() ?? '',
      hint: 'About an hour is usual.',
    },
  ];

  return (
    <>
      <Card title="2. Reaction" id="step-reaction">
        <StepForm url={url} fields={reactionFields} disabled={final} />
        <h3 className="mb-2 mt-4 font-semibold text-fir-900">Temperature</h3>
        <TemperatureLog
          url={url}
          readings={batch.temperatures}
          units={units}
          timeZone={timeZone}
          readOnly={final}
          elevationM={elevationM}
        />
        <div className="mt-3">
          <SafetyNote topics={['methanol']} title="Heating methanol and oil" altitude={altitude} />
        </div>
      </Card>

      <Card title="3. Settling and draining" id="step-settling">
        <StepForm
          url={url}
          disabled={final}
          fields={[
            {
              name: 'settlingHours',
              label: 'Settling time (hours)',
              kind: 'number',
              defaultValue: fieldNumber(batch.settlingHours, 2),
              hint: 'Overnight, 8–24 hours, is usual.',
            },
            {
              name: 'glycerinDrained',
              label: `Glycerin drained (${v})`,
              kind: 'number',
              defaultValue: fieldVolume(batch.glycerinLiters, units),
              aside: (
                <>
                  Crude glycerin layer expected: about {vol(plan.yields.crudeGlycerinLiters, units)} (of which about{' '}
                  {vol(plan.yields.glycerolLiters, units)} pure glycerol; the rest is methanol, catalyst, soap and some
                  fuel).
                </>
              ),
            },
          ]}
        />
        <div className="mt-3">
          <SafetyNote topics={['waste']} title="Glycerin" />
        </div>
      </Card>

      <Card title="4. Washing" id="step-washing">
        <StepForm
          url={url}
          disabled={final}
          fields={[
            {
              name: 'washCycles',
              label: 'Wash cycles',
              kind: 'number',
              defaultValue: batch.washCycles?.toString() ?? '',
              hint: 'Until the water runs clear and near pH 7.',
            },
            {
              name: 'washWater',
              label: `Wash water used (${v})`,
              kind: 'number',
              defaultValue: fieldVolume(batch.washWaterLiters, units),
            },
          ]}
        />
        <div className="mt-3">
          <SafetyNote topics={['waste']} title="Wash water" />
        </div>
      </Card>

      <Card title="5. Drying" id="step-drying">
        <StepForm
          url={url}
          disabled={final}
          fields={[
            {
              name: 'dryingMethod',
              label: 'Drying method',
              kind: 'select',
              defaultValue: batch.dryingMethod ?? '',
              options: [
                { value: '', label: 'Not recorded' },
                { value: 'air', label: 'Open air' },
                { value: 'bubble', label: 'Bubble drying' },
                { value: 'heat', label: 'Heating' },
                { value: 'vacuum', label: 'Vacuum' },
                { value: 'settle', label: 'Settling' },
                { value: 'other', label: 'Other' },
              ],
            },
            {
              name: 'dryingNotes',
              label: 'Drying notes',
              kind: 'textarea',
              defaultValue: batch.dryingNotes ?? '',
              hint: 'Dry until the fuel is clear (target ≤ 500 ppm water).',
            },
          ]}
        />
        <div className="mt-3">
          <SafetyNote topics={['rags']} title="Fuel-soaked rags" />
        </div>
      </Card>
    </>
  );
}
