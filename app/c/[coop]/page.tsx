import Link from 'next/link';
import { TankLevelCard } from '@/components/overview/tank-level-card';
import { VolumeCharts } from '@/components/overview/volume-charts';
import { Card, EmptyState } from '@/components/ui/notice';
import { requireMember } from '@/lib/auth';
import { formatRateCents } from '@/lib/money';
import { getOverview } from '@/lib/overview';
import { formatVolume } from '@/lib/units';

const POLICY_TEXT = { fixed: 'fixed price', 'cost-plus-amount': 'cost plus a margin per gallon', 'cost-plus-percent': 'cost plus a percentage' } as const;

export default async function OverviewPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requireMember(coop, 'coop:read');
  const o = await getOverview(actor);
  const units = actor.coop.units;
  const base = `/c/${actor.coop.slug}`;
  const perUnit = units === 'us' ? 'gal' : 'L';
  const rate = (centsPerGallon: number) => formatRateCents(units === 'us' ? centsPerGallon : centsPerGallon / 3.785411784, actor.coop.currency);
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>{actor.coop.name}</h1>
        <p className="text-stone-600">Hello, {actor.user.name}. You are {actor.role === 'admin' ? 'an' : 'a'} {actor.role} here.</p>
      </div>
      <div className="grid gap-4 md:grid-cols-2">
        <TankLevelCard coop={actor.coop.slug} units={units} initial={o.tank} />
        <Card title="Member price">
          {o.price ? (
            <>
              <p className="text-3xl font-bold text-fir-800 tabular-nums">{rate(o.price.centsPerGallon)} <span className="text-base font-medium text-stone-600">per {perUnit}</span></p>
              <p className="mt-1 text-sm text-stone-600">Off-road and heating use, {POLICY_TEXT[o.price.kind]}{o.tank.avgCostCentsPerGallon !== null ? `; fuel costs the co-op ${rate(o.tank.avgCostCentsPerGallon)} per ${perUnit} on average` : ''}.</p>
              {o.price.roadTaxCentsPerGallon > 0 ? <p className="mt-1 text-sm text-stone-600">Road use adds road-fuel tax of {rate(o.price.roadTaxCentsPerGallon)} per {perUnit}.</p> : null}
            </>
          ) : (
            <p className="text-sm text-stone-600">No price set yet{o.tank.avgCostCentsPerGallon === null ? ' (or no fuel in the tank to base it on)' : ''}. The treasurer sets the pricing policy.</p>
          )}
        </Card>
      </div>

      <Card title="My reservations">
        {o.member.openReservations.length === 0 ? (
          <EmptyState title="No open reservations">
            <Link href={`${base}/me`}>Reserve fuel</Link> for your next fill-up.
          </EmptyState>
        ) : (
          <ul className="divide-y divide-stone-100">
            {o.member.openReservations.map((r) => (
              <li key={r.id} className="flex justify-between py-2 text-sm">
                <span>{formatVolume(Number(r.quantityLiters), units, 1)} from {r.tankName}</span>
                <span className="text-stone-600">until {new Date(r.windowEnd).toLocaleDateString('en-US', { month: 'short', day: 'numeric', timeZone: actor.coop.timezone })}</span>
              </li>
            ))}
          </ul>
        )}
      </Card>

      {o.admin ? (
        <div className="grid gap-4 md:grid-cols-2">
          <Card title="Invitations">
            <p className="text-sm"><strong className="text-2xl text-fir-800">{o.admin.pendingInvitations}</strong> pending{o.admin.notSentInvitations ? `, ${o.admin.notSentInvitations} not sent` : ''}.</p>
            <p className="mt-2 text-sm"><Link href={`${base}/members`}>Manage members and invitations</Link></p>
          </Card>
          <Card title="Recent changes">
            {o.admin.recentEvents.length === 0 ? (
              <p className="text-sm text-stone-600">Nothing yet.</p>
            ) : (
              <ul className="flex flex-col gap-1 text-sm">
                {o.admin.recentEvents.map((e, i) => (
                  <li key={i} className="flex justify-between gap-2">
                    <span><code className="text-xs">{e.action}</code> by {e.who ?? 'system'}</span>
                    <time className="shrink-0 text-stone-600" dateTime={e.at}>{new Date(e.at).toLocaleDateString('en-US', { month: 'short', day: 'numeric', timeZone: actor.coop.timezone })}</time>
                  </li>
                ))}
              </ul>
            )}
            <p className="mt-2 text-sm"><Link href={`${base}/audit`}>Open the audit log</Link></p>
          </Card>
        </div>
      ) : null}

      <VolumeCharts units={units} volumes={o.volumes} level={o.tankLevel} />
    </div>
  );
}
