import type { Metadata } from 'next';
import Link from 'next/link';
import { grams, vol } from '@/components/brewing/format';
import { SafetyNote } from '@/components/brewing/safety-note';
import { ChemicalLotForm } from '@/components/supplies/supply-forms';
import { ChemicalTable } from '@/components/supplies/supply-tables';
import { SuppliesNav } from '@/components/supplies/supplies-nav';
import { Card } from '@/components/ui/notice';
import { can, requirePageActor } from '@/lib/auth';
import { listChemicalLots } from '@/lib/supplies/chemical-lots';
import { stockSummary } from '@/lib/supplies/stock';
import type { UnitSystem } from '@/lib/units';
import { chemicalLotListSchema } from '@/lib/validation/brewing';

export const metadata: Metadata = { title: 'Supplies' };

const NAMES = { methanol: 'Methanol', KOH: 'KOH', NaOH: 'NaOH' } as const;

export default async function SuppliesPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'supplies:read', `/c/${coop}/supplies`);
  const parsed = chemicalLotListSchema.safeParse(await searchParams);
  const q = parsed.success ? parsed.data : chemicalLotListSchema.parse({});
  const [stock, lots] = await Promise.all([stockSummary(actor), listChemicalLots(actor, q)]);
  const units: UnitSystem = actor.coop.units;
  const base = `/c/${actor.coop.slug}`;
  const amount = (unit: 'L' | 'g', x: number) => (unit === 'L' ? vol(x, units, 1) : grams(x));
  const canWrite = can(actor.role, 'supplies:write');
  return (
    <div className="flex flex-col gap-4">
      <div>
        <h1>Supplies</h1>
        <p className="text-sm text-stone-600">
          Chemical purchases and the oil collected, with what is left of each. Batches take chemicals from the oldest
          lots first when they are released.
        </p>
      </div>
      <SuppliesNav base={base} current="chemicals" />
      <section aria-labelledby="stock-h" className="flex flex-col gap-2">
        <h2 id="stock-h">Stock on hand</h2>
        <ul className="grid grid-cols-1 gap-3 sm:grid-cols-3">
          {stock.lines.map((l) => (
            <li
              key={l.kind}
              className={`rounded-xl border bg-white p-4 shadow-sm ${l.low ? 'border-danger-600' : 'border-stone-200'}`}
            >
              <p className="text-sm font-semibold text-stone-700">{NAMES[l.kind]}</p>
              <p className="text-2xl font-bold text-fir-900">{amount(l.unit, l.available)}</p>
              <p className="text-xs text-stone-700">
                available · {amount(l.unit, l.onHand)} in {l.lotsWithStock} lot{l.lotsWithStock === 1 ? '' : 's'}
                {l.committed > 0 ? `, ${amount(l.unit, l.committed)} in batches under way` : ''}
              </p>
              {l.nextPlannedNeed !== null ? (
                <p className={`mt-1 text-sm font-medium ${l.low ? 'text-danger-700' : 'text-ok-700'}`}>
                  {l.low ? 'Low: ' : ''}next planned batch needs {amount(l.unit, l.nextPlannedNeed)}
                </p>
              ) : null}
            </li>
          ))}
        </ul>
        {stock.nextPlannedBatch ? (
          <p className="text-sm text-stone-600">
            Next planned:{' '}
            <Link className="underline" href={`${base}/batches/${stock.nextPlannedBatch.id}`}>
              batch {stock.nextPlannedBatch.number}
            </Link>{' '}
            ({stock.nextPlannedBatch.catalyst}).
          </p>
        ) : (
          <p className="text-sm text-stone-600">No batch is planned, so nothing is flagged as low.</p>
        )}
      </section>
      {canWrite ? (
        <Card title="Record a chemical purchase">
          <ChemicalLotForm slug={actor.coop.slug} units={actor.coop.units} />
        </Card>
      ) : null}
      <section aria-labelledby="lots-h" className="flex flex-col gap-2">
        <h2 id="lots-h">Chemical lots</h2>
        <ChemicalTable
          rows={lots.rows}
          slug={actor.coop.slug}
          units={units}
          currency={actor.coop.currency}
          pageInfo={{ page: lots.page, pageSize: lots.pageSize, total: lots.total }}
          canWrite={canWrite}
        />
      </section>
      <SafetyNote topics={['methanol', 'lye']} title="Storing methanol and lye" />
    </div>
  );
}
