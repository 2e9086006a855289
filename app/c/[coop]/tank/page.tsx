import Link from 'next/link';
import { Card, EmptyState } from '@/components/ui/notice';
import { DipForm } from '@/components/tank/dip-form';
import { LedgerTable } from '@/components/tank/ledger-table';
import { LiveTanks } from '@/components/tank/live-tanks';
import { TankSettingsForm } from '@/components/tank/tank-settings-form';
import { TransferForm } from '@/components/tank/transfer-form';
import { can, requirePageActor } from '@/lib/auth';
import { getCurrentPolicy } from '@/lib/tank/pricing-policy';
import { listTanks } from '@/lib/tank';
import { listMovements } from '@/lib/tank/movements';
import { movementListSchema } from '@/lib/validation/tank';
import { TankLayers } from '@/components/lineage/tank-layers';
import { listTankLayers } from '@/lib/lineage';

export const metadata = { title: 'Tank' };

type SP = Promise<Record<string, string | string[] | undefined>>;

/** The tank page: live gauges for everyone; ledger for brewers, treasurers and admins; dip, transfer and tank settings for brewers and admins. */
export default async function TankPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: SP;
}) {
  const { coop } = await params;
  const sp = await searchParams;
  const actor = await requirePageActor(coop, 'tank:read');
  const { slug, units, currency, timezone } = actor.coop;
  const [tanks, policy] = await Promise.all([listTanks(actor), getCurrentPolicy(actor)]);
  const mayWrite = can(actor.role, 'tank:write');
  const mayLedger = can(actor.role, 'draws:read-all');
  const active = tanks.filter((t) => t.active);
  const selectedId = Number(sp.tank) || tanks[0]?.id;
  const selected = tanks.find((t) => t.id === selectedId);
  const q = movementListSchema.safeParse({ page: sp.page, sort: sp.sort, dir: sp.dir, pageSize: 25 });
  const [ledger, layers] = await Promise.all([
    mayLedger && selected ? listMovements(actor, selected.id, q.success ? q.data : movementListSchema.parse({})) : null,
    Promise.all(active.map((t) => listTankLayers(actor, t.id))),
  ]);

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Tank</h1>
          <p className="text-stone-600">
            What is in the co-op’s tanks, what members have reserved, and what is free to reserve. Figures refresh every
            few seconds.
          </p>
        </div>
        <nav aria-label="Tank pages" className="flex flex-wrap gap-3 text-sm">
          <Link href={`/c/${slug}/me`}>Reserve fuel</Link>
          {can(actor.role, 'draws:read-all') ? <Link href={`/c/${slug}/draws`}>Draws and reservations</Link> : null}
          <Link href={`/c/${slug}/tank/pricing`}>Pricing</Link>
        </nav>
      </div>

      <section aria-labelledby="levels">
        <h2 id="levels" className="sr-only">
          Tank levels
        </h2>
        <LiveTanks coopSlug={slug} initial={{ tanks, units }} currency={currency} timeZone={timezone} />
      </section>

      <Card title="Member price">
        {policy ? (
          <p>
            {policy.description}.{' '}
            <Link className="underline" href={`/c/${slug}/tank/pricing`}>
              See the history
            </Link>
            .
          </p>
        ) : (
          <p className="text-stone-700">
            No price set yet
            {can(actor.role, 'pricing:write') ? (
              <>
                :{' '}
                <Link className="underline" href={`/c/${slug}/tank/pricing`}>
                  set the pricing policy
                </Link>{' '}
                before draws are recorded
              </>
            ) : (
              '; the treasurer sets it'
            )}
            .
          </p>
        )}
      </Card>

      {layers.length ? (
        <section aria-label="Fuel by batch" className="grid gap-6 lg:grid-cols-2">
          {layers.map((l) => (
            <TankLayers key={l.tankId} data={l} base={`/c/${slug}`} canWrite={mayWrite} />
          ))}
        </section>
      ) : null}

      {mayWrite ? (
        <div className="grid gap-6 lg:grid-cols-2">
          {active.length > 0 ? (
            <Card title="Record a dip reading">
              <DipForm coopSlug={slug} units={units} currency={currency} tanks={active} />
            </Card>
          ) : null}
          {active.length > 1 ? (
            <Card title="Move fuel between tanks">
              <TransferForm coopSlug={slug} units={units} tanks={active} />
            </Card>
          ) : null}
          <Card title="Tanks">
            <TankSettingsForm
              coopSlug={slug}
              units={units}
              tanks={tanks.map((t) => ({ id: t.id, name: t.name, capacity: t.capacity, active: t.active }))}
            />
          </Card>
        </div>
      ) : null}

      {mayLedger ? (
        <section aria-labelledby="ledger" className="flex flex-col gap-3">
          <div className="flex flex-wrap items-baseline justify-between gap-2">
            <h2 id="ledger">Ledger{selected ? `: ${selected.name}` : ''}</h2>
            {tanks.length > 1 ? (
              <nav aria-label="Choose a tank’s ledger" className="flex flex-wrap gap-2 text-sm">
                {tanks.map((t) => (
                  <Link
                    key={t.id}
                    href={`/c/${slug}/tank?tank=${t.id}`}
                    aria-current={t.id === selected?.id ? 'page' : undefined}
                    className={`rounded-full border px-3 py-1.5 no-underline ${t.id === selected?.id ? 'border-fir-700 bg-fir-700 text-white' : 'border-stone-300 bg-white text-stone-900'}`}
                  >
                    {t.name}
                  </Link>
                ))}
              </nav>
            ) : null}
          </div>
          {ledger ? (
            <LedgerTable
              rows={ledger.items}
              units={units}
              timeZone={timezone}
              currency={currency}
              pageInfo={{ page: ledger.page, pageSize: ledger.pageSize, total: ledger.total }}
            />
          ) : (
            <EmptyState title="No tank yet">Add a tank above; its ledger appears here.</EmptyState>
          )}
        </section>
      ) : null}
    </div>
  );
}
