import { Card } from '@/components/ui/notice';
import type { BatchDto } from '@/lib/brewing';
import type { UnitSystem } from '@/lib/units';
import { dateText, fieldMoney, fieldNumber, grams, money, vol } from './format';
import { StepForm, type StepField } from './step-form';

/** The batch's costs (energy, feedstock, other) as a form, and the chemicals its release took from stock. */
export function BatchCosts({
  batch,
  units,
  currency,
  url,
  final,
}: {
  batch: BatchDto;
  units: UnitSystem;
  currency: string;
  url: string;
  final: boolean;
}) {
  const costFields: StepField[] = [
    {
      name: 'energyKwh',
      label: 'Metered energy (kWh)',
      kind: 'number',
      defaultValue: fieldNumber(batch.energy.kwh, 3),
      hint: 'Or give heater power and hours instead.',
    },
    {
      name: 'tariffCentsPerKwh',
      label: 'Electricity tariff (¢ per kWh)',
      kind: 'number',
      defaultValue: fieldNumber(batch.energy.tariffCentsPerKwh, 4),
      aside:
        batch.energy.costCents !== null ? (
          <>
            Energy cost: <strong>{money(batch.energy.costCents, currency)}</strong>
          </>
        ) : (
          <span className="text-stone-600">Energy is not counted until a tariff and an amount are given.</span>
        ),
    },
    {
      name: 'heaterKw',
      label: 'Heater power (kW)',
      kind: 'number',
      defaultValue: fieldNumber(batch.energy.heaterKw, 3),
    },
    {
      name: 'heaterHours',
      label: 'Heating time (hours)',
      kind: 'number',
      defaultValue: fieldNumber(batch.energy.heaterHours, 2),
    },
    {
      name: 'feedstockCost',
      label: 'Feedstock cost ($), if not the oil lots’ cost',
      kind: 'number',
      defaultValue: fieldMoney(batch.feedstockCentsOverride),
      aside: (
        <>
          From the oil lots: <strong>{money(batch.feedstockFromLotsCents, currency)}</strong>
        </>
      ),
    },
    {
      name: 'otherCost',
      label: 'Other costs ($)',
      kind: 'number',
      defaultValue: fieldMoney(batch.otherCents),
      omitEmpty: true,
      hint: 'Water, filters, acid for washing…',
    },
    { name: 'otherNotes', label: 'What the other costs were', kind: 'textarea', defaultValue: batch.otherNotes ?? '' },
  ];

  return (
    <>
      <Card title="Costs">
        <StepForm url={url} fields={costFields} disabled={final} />
      </Card>

      {batch.consumptions.length ? (
        <Card title="Chemicals taken from stock">
          <ul className="text-sm">
            {batch.consumptions.map((c) => (
              <li key={c.chemicalLotId} className="border-b border-stone-100 py-1">
                {c.unit === 'L' ? vol(c.quantity, units, 2) : grams(c.quantity)} {c.kind} from the lot received{' '}
                {dateText(c.receivedOn)} ({c.supplier}) — {money(c.costCents, currency)}
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
    </>
  );
}
