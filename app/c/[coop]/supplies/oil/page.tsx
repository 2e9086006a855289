import type { Metadata } from 'next';
import { OilLotForm } from '@/components/supplies/supply-forms';
import { OilTable } from '@/components/supplies/supply-tables';
import { SuppliesNav } from '@/components/supplies/supplies-nav';
import { Card } from '@/components/ui/notice';
import { can, requirePageActor } from '@/lib/auth';
import { listOilLots } from '@/lib/supplies/oil-lots';
import { oilLotListSchema } from '@/lib/validation/brewing';

export const metadata: Metadata = { title: 'Oil lots' };

export default async function OilLotsPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: Promise<Record<string, string>>;
}) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'supplies:read', `/c/${coop}/supplies/oil`);
  const parsed = oilLotListSchema.safeParse(await searchParams);
  const lots = await listOilLots(actor, parsed.success ? parsed.data : oilLotListSchema.parse({}));
  return (
    <div className="flex flex-col gap-4">
      <div>
        <h1>Supplies</h1>
        <p className="text-sm text-stone-600">
          Used cooking oil as collected: where from, how much, its titration, and how much batches have used.
        </p>
      </div>
      <SuppliesNav base={`/c/${actor.coop.slug}`} current="oil" />
      {can(actor.role, 'supplies:write') ? (
        <Card title="Record collected oil">
          <OilLotForm slug={actor.coop.slug} units={actor.coop.units} />
        </Card>
      ) : null}
      <section aria-labelledby="oil-h" className="flex flex-col gap-2">
        <h2 id="oil-h">Oil lots</h2>
        <OilTable
          rows={lots.rows}
          units={actor.coop.units}
          currency={actor.coop.currency}
          pageInfo={{ page: lots.page, pageSize: lots.pageSize, total: lots.total }}
        />
      </section>
    </div>
  );
}
