import { Card, Notice } from '@/components/ui/notice';
import type { BatchDto } from '@/lib/brewing';
import type { UnitSystem } from '@/lib/units';
import { Figure } from './figure';
import { dateText, money, perUnit, vol } from './format';

/** How a finished batch ended: the rejection and what was written off, or the release with its cost breakdown. */
export function BatchOutcome({
  batch,
  units,
  currency,
  timeZone,
}: {
  batch: BatchDto;
  units: UnitSystem;
  currency: string;
  timeZone: string;
}) {
  if (batch.status === 'rejected') {
    return (
      <div id="step-result" className="scroll-mt-28">
        <Notice tone="danger" title={`Rejected ${dateText(batch.rejectedAt, timeZone)}`}>
          <p>{batch.rejectReason}</p>
          {batch.costs ? <p className="mt-1">Inputs written off: {money(batch.costs.totalCents, currency)}.</p> : null}
        </Notice>
      </div>
    );
  }
  if (batch.status === 'released' && batch.costs && batch.release) {
    return (
      <Card title="Released" id="step-result">
        <dl className="grid grid-cols-1 gap-3 sm:grid-cols-3">
          <Figure
            label="Into the tank"
            value={vol(batch.release.releasedLiters, units)}
            sub={`${batch.release.tankName ?? 'Tank'} · ${dateText(batch.release.releasedAt, timeZone)}`}
          />
          <Figure
            label={`Cost per ${units === 'us' ? 'gallon' : 'litre'}`}
            value={perUnit(batch.costs.costPerGallonCents, batch.costs.costPerLiterCents, units, currency)}
          />
          <Figure label="Batch cost" value={money(batch.costs.totalCents, currency)} />
        </dl>
        <CostBreakdown costs={batch.costs} currency={currency} />
      </Card>
    );
  }
  return null;
}

function CostBreakdown({ costs, currency }: { costs: NonNullable<BatchDto['costs']>; currency: string }) {
  const rows: [string, number][] = [
    ['Methanol', costs.methanolCents],
    ['Catalyst', costs.catalystCents],
    ['Energy', costs.energyCents],
    ['Feedstock', costs.feedstockCents],
    ['Other', costs.otherCents],
  ];
  return (
    <table className="mt-3 w-full max-w-sm text-sm">
      <caption className="sr-only">Cost breakdown</caption>
      <tbody>
        {rows.map(([k, c]) => (
          <tr key={k} className="border-b border-stone-100">
            <th scope="row" className="py-1 text-left font-normal">
              {k}
            </th>
            <td className="py-1 text-right">{money(c, currency)}</td>
          </tr>
        ))}
        <tr>
          <th scope="row" className="py-1 text-left">
            Total
          </th>
          <td className="py-1 text-right font-semibold">{money(costs.totalCents, currency)}</td>
        </tr>
      </tbody>
    </table>
  );
}
