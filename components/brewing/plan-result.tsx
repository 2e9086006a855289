import { Notice } from '@/components/ui/notice';
import type { PlannerResultDto as PlannerResult } from '@/lib/api/dto/brewing';
import type { UnitSystem } from '@/lib/units';
import { grams, money, perUnit, vol } from './format';

const PURITY_SOURCE: Record<string, string> = {
  typed: 'as typed',
  'next-lot': 'from the lot in stock that is used next',
  recipe: 'from the co-op’s recipe',
  typical: 'typical for flake (common practice)',
};
function Big({ label, value, sub }: { label: string; value: string; sub?: string }) {
  return (
    <div className="rounded-lg border border-stone-200 bg-white p-3 shadow-sm">
      <p className="text-xs uppercase tracking-wide text-stone-600">{label}</p>
      <p className="text-2xl font-bold text-fir-900">{value}</p>
      {sub ? <p className="text-xs text-stone-700">{sub}</p> : null}
    </div>
  );
}

/** What the planner worked out: catalyst and methanol to measure, stock coverage and the projected cost. */
export function PlanResult({ r, units, currency }: { r: PlannerResult; units: UnitSystem; currency: string }) {
  const { plan, coverage, projected } = r;
  return (
    <>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <Big
          label={`${plan.catalyst} to weigh`}
          value={grams(plan.catalystResult.totalGrams)}
          sub={`${plan.catalystResult.gramsPerLiter.toFixed(2)} g/L · purity ${plan.purityPct} % ${PURITY_SOURCE[plan.puritySource] ?? ''}`}
        />
        <Big
          label="Methanol"
          value={vol(plan.methanol.liters, units, 2)}
          sub={
            plan.methanol.mode === 'percent'
              ? `${plan.methanol.pct} % of the oil ≈ ${plan.methanol.equivalentMolarRatio.toFixed(1)}:1 molar`
              : `${plan.methanol.molarRatio}:1 molar = ${plan.methanol.equivalentPct.toFixed(1)} % of the oil`
          }
        />
      </div>
      <p className="text-sm text-stone-700">
        <span className="font-semibold">Rule applied:</span> {plan.catalystResult.explanation}
      </p>
      <div className="rounded-lg border border-stone-200 bg-white p-3 text-sm">
        <p>
          Titration average <strong>{plan.titration.averageMl.toFixed(2)} mL</strong> (
          {plan.titration.source === 'oil-lot'
            ? 'from the oil lot'
            : `${plan.titration.trials.length} trial${plan.titration.trials.length === 1 ? '' : 's'}`}
          , {plan.titration.titrant} titrant).
        </p>
        <p>
          Acid number <strong>{plan.oil.acidNumber.toFixed(2)} mg KOH/g</strong>, free fatty acids{' '}
          <strong>{plan.oil.ffaPercent.toFixed(2)} %</strong> as oleic acid.
        </p>
        {plan.titration.notice ? <p className="mt-1 text-warn-700">{plan.titration.notice}</p> : null}
      </div>
      <Notice
        tone={plan.oil.needsAcidPretreatment ? 'warn' : 'info'}
        title={plan.oil.needsAcidPretreatment ? 'Acid pre-treatment advised' : undefined}
      >
        {plan.oil.message}
      </Notice>

      <div className="overflow-x-auto rounded-lg border border-stone-200 bg-white">
        <table className="w-full text-left text-sm">
          <caption className="px-2 pt-2 text-left sm:px-3 font-semibold text-fir-900">Stock</caption>
          <thead className="text-xs uppercase tracking-wide text-stone-700">
            <tr>
              <th scope="col" className="px-2 py-1 sm:px-3">
                Chemical
              </th>
              <th scope="col" className="px-2 py-1 sm:px-3">
                Needed
              </th>
              <th scope="col" className="px-2 py-1 sm:px-3">
                Available
              </th>
              <th scope="col" className="px-2 py-1 sm:px-3">
                At lot prices
              </th>
            </tr>
          </thead>
          <tbody>
            {coverage.map((c) => (
              <tr key={c.kind} className="border-t border-stone-100">
                <th scope="row" className="px-2 py-1 sm:px-3.5">
                  {c.kind}
                </th>
                <td className="px-2 py-1 sm:px-3.5">{c.unit === 'L' ? vol(c.needed, units, 2) : grams(c.needed)}</td>
                <td className={`px-2 py-1 sm:px-3.5 ${c.covered ? '' : 'font-semibold text-danger-700'}`}>
                  {c.unit === 'L' ? vol(c.available, units, 2) : grams(c.available)}
                  {c.covered ? '' : ` — short by ${c.unit === 'L' ? vol(c.shortBy, units, 2) : grams(c.shortBy)}`}
                </td>
                <td className="px-2 py-1 sm:px-3.5">
                  {money(c.projectedCents, currency)}
                  {c.shortfallCents !== null ? (
                    <span className="block text-xs text-stone-600">
                      incl. {money(c.shortfallCents, currency)} for the shortfall at the last price paid
                    </span>
                  ) : c.covered ? null : (
                    <span className="block text-xs text-danger-700">shortfall not priced: none bought before</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <Big
          label={`Projected cost per ${units === 'us' ? 'gallon' : 'litre'}`}
          value={perUnit(projected.costPerGallonCents, projected.costPerLiterCents, units, currency)}
          sub={`${money(projected.totalCents, currency)} for the batch: methanol ${money(projected.methanolCents, currency)}, catalyst ${money(projected.catalystCents, currency)}, energy ${money(projected.energyCents, currency)}, feedstock ${money(projected.feedstockCents, currency)}`}
        />
        <Big
          label="Expected"
          value={`${vol(plan.projectedFuelLiters, units)} fuel`}
          sub={`${plan.yieldProjection.source === 'history' ? `${(plan.yieldProjection.ratio * 100).toFixed(0)} % of the oil, the median of your last ${plan.yieldProjection.batches} finished batch${plan.yieldProjection.batches === 1 ? '' : 'es'}; ideal ${vol(plan.yields.fuelLiters, units)}` : `the stoichiometric ideal (no finished batches yet); real batches release less`}. Crude glycerin layer about ${vol(plan.yields.crudeGlycerinLiters, units)} (pure glycerol ${vol(plan.yields.glycerolLiters, units)}).`}
        />
      </div>
      {r.notes.length ? (
        <ul className="list-disc pl-5 text-sm text-stone-700">
          {r.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      ) : null}
    </>
  );
}
