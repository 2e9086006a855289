import Link from 'next/link';
import { Card, Notice } from '@/components/ui/notice';
import { DrawsTable } from '@/components/tank/draws-table';
import { LiveTanks } from '@/components/tank/live-tanks';
import { RecordDrawForm } from '@/components/tank/record-draw-form';
import { ReservationsTable } from '@/components/tank/reservations-table';
import { ReserveForm } from '@/components/tank/reserve-form';
import { requirePageActor } from '@/lib/auth';
import { listDraws } from '@/lib/tank/draws';
import { getCurrentPolicy } from '@/lib/tank/pricing-policy';
import { listReservations } from '@/lib/tank/reservations';
import { listTanks } from '@/lib/tank';
import { isoDay } from '@/lib/dates';
import { drawListSchema, reservationListSchema } from '@/lib/validation/tank';

export const metadata = { title: 'My fuel' };

type SP = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) || undefined;

/** A member's own page: live availability, reserve form, my reservations (cancel), my draws. */
export default async function MyFuelPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: SP;
}) {
  const { coop } = await params;
  const sp = await searchParams;
  const actor = await requirePageActor(coop, 'reservations:own');
  const { slug, units, currency, timezone } = actor.coop;
  const dq = drawListSchema.safeParse({ page: one(sp.page), sort: one(sp.sort), dir: one(sp.dir), pageSize: 20 });
  const [tanks, policy, reservations, draws] = await Promise.all([
    listTanks(actor),
    getCurrentPolicy(actor),
    listReservations(actor, reservationListSchema.parse({ pageSize: 50 }), { own: true }),
    listDraws(actor, dq.success ? dq.data : drawListSchema.parse({ pageSize: 20 }), { own: true }),
  ]);
  const now = new Date();
  const selfServe = actor.coop.settings?.selfServeDraws === true;
  const open = reservations.items.filter((r) => r.status === 'open');
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1>My fuel</h1>
        <p className="text-stone-600">
          Reserve fuel, see what you have reserved and what you have drawn.{' '}
          {policy ? <>Price now: {policy.description}.</> : null}
        </p>
      </div>

      <div className="grid gap-6 lg:grid-cols-2">
        <Card title="Reserve fuel">
          <ReserveForm
            coopSlug={slug}
            initial={{ tanks, units }}
            pricing={policy?.policy}
            currency={currency}
            today={isoDay(now, timezone)}
            defaultEnd={isoDay(new Date(now.getTime() + 3 * 86_400_000), timezone)}
          />
        </Card>
        <section aria-labelledby="available" className="flex flex-col gap-3">
          <h2 id="available">Available now</h2>
          <LiveTanks
            coopSlug={slug}
            initial={{ tanks, units }}
            currency={currency}
            timeZone={timezone}
            showInactive={false}
          />
        </section>
      </div>

      {selfServe ? (
        <Card title="Record my draw (self-serve pump)">
          {policy ? (
            <RecordDrawForm
              selfServe
              coopSlug={slug}
              units={units}
              currency={currency}
              tanks={tanks.filter((t) => t.active)}
              members={[{ membershipId: actor.membershipId, name: actor.user.name }]}
              reservations={open}
            />
          ) : (
            <Notice tone="warn">No member price is set yet, so draws cannot be recorded.</Notice>
          )}
        </Card>
      ) : null}

      <section aria-labelledby="my-res" className="flex flex-col gap-3">
        <h2 id="my-res">My reservations</h2>
        <ReservationsTable
          rows={reservations.items.map((r) => ({ ...r, canCancel: true }))}
          units={units}
          timeZone={timezone}
          coopSlug={slug}
          showMember={false}
        />
      </section>

      <section aria-labelledby="my-draws" className="flex flex-col gap-3">
        <h2 id="my-draws">My draws</h2>
        <DrawsTable
          caption="My draws"
          rows={draws.items}
          units={units}
          timeZone={timezone}
          currency={currency}
          coopSlug={slug}
          showMember={false}
          canReverse={false}
          sortable={['occurred_at', 'quantity', 'total']}
          pageInfo={{ page: draws.page, pageSize: draws.pageSize, total: draws.total }}
        />
        <p className="text-sm text-stone-600">
          Draws are billed on your monthly invoice. Something wrong with a draw? Ask a brewer: they correct it with a
          reversing entry.{' '}
          <Link className="underline" href={`/c/${slug}/tank`}>
            See the tank
          </Link>
          .
        </p>
      </section>
    </div>
  );
}
