import type { Metadata } from 'next';
import { PlannerForm } from '@/components/brewing/planner-form';
import { SafetyNote } from '@/components/brewing/safety-note';
import { dateText, vol } from '@/components/brewing/format';
import { requirePageActor } from '@/lib/auth';
import { listOilLotsWithOil } from '@/lib/supplies/oil-lots';

export const metadata: Metadata = { title: 'Batch planner' };

export default async function PlannerPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'batches:write', `/c/${coop}/planner`);
  const lots = await listOilLotsWithOil(actor);
  const recipe = actor.coop.settings.recipe ?? {};
  const units = actor.coop.units;
  return (
    <div className="flex flex-col gap-4">
      <div>
        <h1>Batch planner</h1>
        <p className="text-sm text-stone-600">
          Oil volume and titration in; catalyst, methanol, oil acidity, whether stock covers it and the projected cost
          per {units === 'us' ? 'gallon' : 'litre'} out. Nothing is saved until you create the batch.
        </p>
      </div>
      <PlannerForm
        slug={actor.coop.slug}
        units={units}
        currency={actor.coop.currency}
        recipe={{
          catalyst: recipe.catalyst ?? 'KOH',
          baseGramsPerLiter: recipe.baseGramsPerLiter ?? null,
          purityPct: recipe.purityPct ?? null,
          methanolPct: recipe.methanolPct ?? null,
        }}
        oilLots={lots.map((l) => ({
          id: l.id,
          label: `${l.collectedFrom}, ${dateText(l.collectedOn)} — ${vol(l.remainingLiters, units)} left${l.titrationMl !== null ? `, titration ${l.titrationMl} mL` : ''}`,
          remainingLiters: l.remainingLiters,
          titrationMl: l.titrationMl,
          titrant: l.titrant,
        }))}
      />
      <SafetyNote topics={['methanol', 'lye', 'protective-equipment']} />
    </div>
  );
}
