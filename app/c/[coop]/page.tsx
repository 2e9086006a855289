import Link from 'next/link';
import { auditSentence } from '@/components/audit/audit-words';
import { formatDate, formatMonthDay } from '@/lib/dates';
import { BalancesChart, BatchCostChart } from '@/components/overview/cost-charts';
import { TankLevelCard } from '@/components/overview/tank-level-card';
import { VolumeCharts } from '@/components/overview/volume-charts';
import { Card, EmptyState } from '@/components/ui/notice';
import { can, requirePageActor } from '@/lib/auth';
import { unacknowledgedDangers } from '@/lib/brewing';
import { DangerBanner } from '@/components/brewing/danger-banner';
import { QualityBadge } from '@/components/brewing/badges';
import { formatCents, formatRateCents } from '@/lib/money';
import { getOverview } from '@/lib/overview';
import { formatVolume } from '@/lib/units';
import { RecallNotices } from '@/components/lineage/recall-notices';
import { recallNoticesFor } from '@/lib/lineage';

const POLICY_TEXT = {
  fixed: 'fixed price',
  'cost-plus-amount': 'cost plus a fixed margin',
  'cost-plus-percent': 'cost plus a percentage',
} as const;

export default async function OverviewPage({ params }: { params: Promise<{ coop: string }> }) {
  const { coop } = await params;
  const actor = await requirePageActor(coop, 'coop:read');
  const brewing = can(actor.role, 'batches:read-all');
  const [o, dangers, recalls] = await Promise.all([
    getOverview(actor),
    brewing ? unacknowledgedDangers(actor.coop.id) : Promise.resolve([]),
    recallNoticesFor(actor),
  ]);
  const units = actor.coop.units;
  const base = `/c/${actor.coop.slug}`;
  const perUnit = units === 'us' ? 'gal' : 'L';
  const money = (cents: number) => formatCents(cents, actor.coop.currency);
  const chem = (kind: string, v: number) =>
    kind === 'methanol'
      ? formatVolume(Math.max(v, 0), units, 1)
      : `${Math.round(Math.max(v, 0)).toLocaleString('en-US')} g`;
  const rate = (centsPerGallon: number) =>
    formatRateCents(units === 'us' ? centsPerGallon : centsPerGallon / 3.785411784, actor.coop.currency);
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>{actor.coop.name}</h1>
        <p className="text-stone-600">
          Hello, {actor.user.name}. You are {actor.role === 'admin' ? 'an' : 'a'} {actor.role} here.
        </p>
      </div>
      <DangerBanner
        alerts={dangers}
        slug={actor.coop.slug}
        units={units}
        canAcknowledge={can(actor.role, 'batches:write')}
      />
      <RecallNotices notices={recalls} units={units} />
      <div className="grid gap-4 md:grid-cols-2">
        <TankLevelCard coop={actor.coop.slug} units={units} initial={o.tank} />
        <Card title="Member price">
          {o.price ? (
            <>
              <p className="text-3xl font-bold text-fir-800 tabular-nums">
                {rate(o.price.centsPerGallon)}{' '}
                <span className="text-base font-medium text-stone-600">per {perUnit}</span>
              </p>
              <p className="mt-1 text-sm text-stone-600">
                Off-road and heating use, {POLICY_TEXT[o.price.kind]}
                {o.tank.avgCostCentsPerGallon !== null
                  ? `; fuel costs the co-op ${rate(o.tank.avgCostCentsPerGallon)} per ${perUnit} on average`
                  : ''}
                .
              </p>
              {o.price.roadTaxCentsPerGallon > 0 ? (
                <p className="mt-1 text-sm text-stone-600">
                  Road use adds road-fuel tax of {rate(o.price.roadTaxCentsPerGallon)} per {perUnit}.
                </p>
              ) : null}
            </>
          ) : (
            <p className="text-sm text-stone-600">
              No price set yet{o.tank.avgCostCentsPerGallon === null ? ' (or no fuel in the tank to base it on)' : ''}.
              The treasurer sets the pricing policy.
            </p>
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
                <span>
                  {formatVolume(Number(r.quantityLiters), units, 1)} from {r.tankName}
                </span>
                <span className="text-stone-600">
                  last day {formatMonthDay(new Date(new Date(r.windowEnd).getTime() - 1), actor.coop.timezone)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </Card>

      <Card title="My account">
        {o.account.outstandingCents > 0 ? (
          <p className="text-sm">
            <strong className="text-2xl text-fir-800 tabular-nums">{money(o.account.outstandingCents)}</strong> unpaid
            on your invoices.
          </p>
        ) : (
          <p className="text-sm">Nothing unpaid — you are all square.</p>
        )}
        {o.account.creditCents > 0 ? (
          <p className="mt-1 text-sm text-stone-600">
            You have {money(o.account.creditCents)} in credit, applied to your next invoice.
          </p>
        ) : null}
        {o.account.unallocatedCents > 0 ? (
          <p className="mt-1 text-sm text-stone-600">
            {money(o.account.unallocatedCents)} of your payments is waiting for the treasurer to match it.
          </p>
        ) : null}
        <p className="mt-2 text-sm">
          <Link href={`${base}/invoices`}>See and pay my invoices</Link>
        </p>
      </Card>

      {o.brewer ? (
        <section aria-labelledby="brewing-heading" className="flex flex-col gap-3">
          <h2 id="brewing-heading">Brewing</h2>
          <div className="grid gap-4 md:grid-cols-2">
            <Card title="Batches under way">
              {o.brewer.inProgress.length === 0 ? (
                <p className="text-sm text-stone-600">No batch is under way.</p>
              ) : (
                <ul className="divide-y divide-stone-100">
                  {o.brewer.inProgress.map((b) => (
                    <li key={b.id} className="flex flex-col gap-1 py-2 text-sm">
                      <div className="flex justify-between gap-2">
                        <Link href={`${base}/batches/${b.id}`}>Batch {b.number}</Link>
                        <span className="text-stone-600">
                          {b.status}, {formatVolume(b.oilLiters, units, 0)} of oil
                        </span>
                      </div>
                      {b.quality ? (
                        <div>
                          <QualityBadge text={b.quality.text} kind={b.quality.kind} />
                        </div>
                      ) : null}
                    </li>
                  ))}
                </ul>
              )}
              {o.brewer.recentReleased.length ? (
                <>
                  <h3 className="mt-3 text-sm font-semibold text-fir-900">Latest released</h3>
                  <ul className="divide-y divide-stone-100">
                    {o.brewer.recentReleased.map((b) => (
                      <li key={b.id} className="flex flex-col gap-1 py-2 text-sm">
                        <div className="flex justify-between gap-2">
                          <Link href={`${base}/batches/${b.id}`}>Batch {b.number}</Link>
                          <span className="text-stone-600">
                            {formatVolume(b.releasedLiters, units, 0)},{' '}
                            {formatMonthDay(b.releasedAt, actor.coop.timezone)}
                          </span>
                        </div>
                        <div>
                          <QualityBadge text={b.quality.text} kind={b.quality.kind} />
                        </div>
                      </li>
                    ))}
                  </ul>
                </>
              ) : null}
              <p className="mt-2 text-sm">
                <Link href={`${base}/batches`}>All batches</Link>
              </p>
            </Card>
            <Card title="Next planned batch">
              {o.brewer.nextPlanned ? (
                <>
                  <p className="text-sm">
                    <Link href={`${base}/batches/${o.brewer.nextPlanned.id}`}>Batch {o.brewer.nextPlanned.number}</Link>
                    : {formatVolume(o.brewer.nextPlanned.oilLiters, units, 0)} of oil with{' '}
                    {o.brewer.nextPlanned.catalyst}, planned for{' '}
                    {formatDate(o.brewer.nextPlanned.batchDate, actor.coop.timezone)}.
                  </p>
                  <ul className="mt-2 flex flex-col gap-1 text-sm">
                    {o.brewer.stock.map((s) => (
                      <li key={s.kind} className={s.low ? 'font-medium text-danger-700' : 'text-stone-700'}>
                        {s.low ? 'Short: ' : 'Covered: '}
                        {s.kind} — {chem(s.kind, s.available)} available, needs {chem(s.kind, s.need)}
                      </li>
                    ))}
                  </ul>
                  <p className="mt-2 text-sm">
                    <Link href={`${base}/supplies`}>Supplies and stock</Link>
                  </p>
                </>
              ) : (
                <p className="text-sm text-stone-600">
                  No batch is planned. <Link href={`${base}/planner`}>Plan one</Link> to check the chemicals it needs.
                </p>
              )}
            </Card>
          </div>
        </section>
      ) : null}

      {o.treasurer ? (
        <section aria-labelledby="billing-heading" className="flex flex-col gap-3">
          <h2 id="billing-heading">Billing this month</h2>
          <Card>
            <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
              <div>
                <dt className="text-sm text-stone-600">Invoiced ({o.treasurer.period})</dt>
                <dd className="text-xl font-bold tabular-nums">{money(o.treasurer.invoicedCents)}</dd>
              </div>
              <div>
                <dt className="text-sm text-stone-600">Paid</dt>
                <dd className="text-xl font-bold tabular-nums">{money(o.treasurer.paidCents)}</dd>
              </div>
              <div>
                <dt className="text-sm text-stone-600">Outstanding</dt>
                <dd className="text-xl font-bold tabular-nums">{money(o.treasurer.outstandingCents)}</dd>
              </div>
              <div>
                <dt className="text-sm text-stone-600">Unmatched payments</dt>
                <dd className="text-xl font-bold tabular-nums">{o.treasurer.unmatchedPayments}</dd>
              </div>
            </dl>
            <p className="mt-2 text-sm text-stone-600">
              {o.treasurer.invoices} invoice{o.treasurer.invoices === 1 ? '' : 's'} issued
              {o.treasurer.drafts ? `, ${o.treasurer.drafts} draft${o.treasurer.drafts === 1 ? '' : 's'} waiting` : ''}
              {o.treasurer.unmatchedPayments
                ? `; ${money(o.treasurer.unmatchedCents)} received but not matched to an invoice`
                : ''}
              .
            </p>
            <p className="mt-2 text-sm">
              <Link href={`${base}/billing`}>Open billing</Link>
            </p>
          </Card>
        </section>
      ) : null}

      {o.admin ? (
        <div className="grid gap-4 md:grid-cols-2">
          <Card title="Invitations">
            <p className="text-sm">
              <strong className="text-2xl text-fir-800">{o.admin.pendingInvitations}</strong> pending
              {o.admin.notSentInvitations ? `, ${o.admin.notSentInvitations} not sent` : ''}.
            </p>
            <p className="mt-2 text-sm">
              <Link href={`${base}/members`}>Manage members and invitations</Link>
            </p>
          </Card>
          <Card title="Recent changes">
            {o.admin.recentEvents.length === 0 ? (
              <p className="text-sm text-stone-600">Nothing yet.</p>
            ) : (
              <ul className="flex flex-col gap-1 text-sm">
                {o.admin.recentEvents.map((e, i) => (
                  <li key={i} className="flex justify-between gap-2">
                    <span>
                      {auditSentence({
                        action: e.action,
                        actorName: e.who ?? null,
                        entityType: '',
                        entityId: null,
                        before: null,
                        after: null,
                      })}
                    </span>
                    <time className="shrink-0 text-stone-600" dateTime={e.at}>
                      {formatMonthDay(e.at, actor.coop.timezone)}
                    </time>
                  </li>
                ))}
              </ul>
            )}
            <p className="mt-2 text-sm">
              <Link href={`${base}/audit`}>Open the audit log</Link>
            </p>
          </Card>
        </div>
      ) : null}

      <VolumeCharts units={units} volumes={o.volumes} level={o.tankLevel} />
      {o.batchCosts || o.balances ? (
        <div className="grid gap-4 lg:grid-cols-2">
          {o.batchCosts ? <BatchCostChart units={units} currency={actor.coop.currency} costs={o.batchCosts} /> : null}
          {o.balances ? (
            <div className="flex flex-col gap-2">
              <BalancesChart currency={actor.coop.currency} rows={o.balances.topOwing} />
              <p className="text-sm text-stone-600">
                {o.balances.membersOwing === 0
                  ? 'No member owes anything on issued invoices.'
                  : `${o.balances.membersOwing} member${o.balances.membersOwing === 1 ? ' owes' : 's owe'} ${money(o.balances.totalOutstandingCents)} in all.`}
              </p>
            </div>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
