import Link from 'next/link';
import { Card, Notice } from '@/components/ui/notice';
import { PricingForm } from '@/components/tank/pricing-form';
import { PricingHistoryTable } from '@/components/tank/pricing-history-table';
import { can, requirePageActor } from '@/lib/auth';
import { listPolicies } from '@/lib/tank/pricing-policy';
import { listTanks } from '@/lib/tank';
import { volumeLabel } from '@/lib/units';

export const metadata = { title: 'Pricing' };

/** The member price: the policy in force, its history, and (treasurer/admin) a form to set a new one. */
export default async function PricingPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'tank:read');
  const { slug, units, currency, timezone } = actor.coop;
  const [policies, tanks] = await Promise.all([listPolicies(actor), listTanks(actor)]);
  // The preview prices at the average cost of the in-service tank holding the most fuel.
  const costTank = tanks
    .filter((t) => t.active && t.onHandLiters > 0 && t.avgCostCentsPerUnit !== null)
    .sort((a, b) => b.onHandLiters - a.onHandLiters)[0];
  const current = policies.find((p) => p.status === 'in-force');
  return (
    <div className="flex flex-col gap-6">
      <div>
        <p className="text-sm">
          <Link href={`/c/${slug}/tank`}>← Tank</Link>
        </p>
        <h1>Pricing</h1>
        <p className="text-stone-600">
          The member price per {volumeLabel(units)} recovers what the fuel cost the co-op. Each draw keeps the price in
          force when it was recorded; a new policy never changes past draws. Amounts are rounded to the cent per line,
          halves away from zero.
        </p>
      </div>
      <Card title="In force now">
        {current ? (
          <p className="text-lg font-semibold text-fir-900">{current.description}</p>
        ) : (
          <Notice tone="warn">No price is set, so draws cannot be recorded yet.</Notice>
        )}
      </Card>
      {can(actor.role, 'pricing:write') ? (
        <Card title="Set a new price">
          <PricingForm
            coopSlug={slug}
            units={units}
            currency={currency}
            current={current?.policy}
            costCentsPerUnit={costTank?.avgCostCentsPerUnit ?? null}
            costTank={costTank?.name}
          />
        </Card>
      ) : null}
      <section aria-labelledby="history" className="flex flex-col gap-3">
        <h2 id="history">History</h2>
        <PricingHistoryTable
          timeZone={timezone}
          rows={policies.map((p) => ({
            id: p.id,
            description: p.description,
            effectiveFrom: p.effectiveFrom,
            createdBy: p.createdBy,
            status: p.status,
          }))}
        />
      </section>
    </div>
  );
}
