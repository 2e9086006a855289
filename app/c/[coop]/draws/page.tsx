import Link from 'next/link';
import { Card, Notice } from '@/components/ui/notice';
import { DrawsTable } from '@/components/tank/draws-table';
import { RecordDrawForm } from '@/components/tank/record-draw-form';
import { ReservationsTable } from '@/components/tank/reservations-table';
import { can, requirePageActor } from '@/lib/auth';
import { lastMeterReadings, listDrawMembers, listDraws } from '@/lib/tank/draws';
import { formatCents } from '@/lib/money';
import { getCurrentPolicy } from '@/lib/tank/pricing-policy';
import { listReservations } from '@/lib/tank/reservations';
import { listTanks } from '@/lib/tank';
import { formatMl } from '@/lib/tank/volume';
import { drawListSchema, DRAW_STATUSES, reservationListSchema, RESERVATION_STATUSES } from '@/lib/validation/tank';

export const metadata = { title: 'Draws' };

type SP = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) || undefined;

/** Draws and reservations for brewers, treasurers and admins, with filters; brewers record and reverse draws here. */
export default async function DrawsPage({
  params,
  searchParams,
}: {
  params: Promise<{ coop: string }>;
  searchParams: SP;
}) {
  const { coop } = await params;
  const sp = await searchParams;
  const actor = await requirePageActor(coop, 'draws:read-all');
  const { slug, units, currency, timezone } = actor.coop;
  const view = one(sp.view) === 'reservations' ? 'reservations' : 'draws';
  const filters = {
    membershipId: one(sp.membershipId),
    status: one(sp.status),
    from: one(sp.from),
    to: one(sp.to),
    tankId: one(sp.tankId),
  };
  const base = { page: one(sp.page), sort: one(sp.sort), dir: one(sp.dir), pageSize: 25 };
  const mayRecord = can(actor.role, 'draws:record');

  const [members, tanks, policy, openRes, lastMeter] = await Promise.all([
    listDrawMembers(actor),
    listTanks(actor),
    getCurrentPolicy(actor),
    mayRecord
      ? listReservations(
          actor,
          reservationListSchema.parse({ status: 'open', pageSize: 200, sort: 'window_end', dir: 'asc' }),
        )
      : null,
    mayRecord ? lastMeterReadings(actor) : {},
  ]);

  let filterError: string | null = null;
  let content: React.ReactNode;
  if (view === 'draws') {
    const parsed = drawListSchema.safeParse({ ...base, ...filters });
    if (!parsed.success) filterError = 'Some filters were not understood and were ignored.';
    const q = parsed.success ? parsed.data : drawListSchema.parse({});
    const draws = await listDraws(actor, q);
    content = (
      <>
        <p className="text-sm text-stone-700" data-testid="draw-totals">
          {draws.total} {draws.total === 1 ? 'entry' : 'entries'} · net{' '}
          {formatMl(Math.round(draws.totals.quantityLiters * 1000), units)} ·{' '}
          {formatCents(draws.totals.totalCents, currency)}
        </p>
        <DrawsTable
          rows={draws.items}
          units={units}
          timeZone={timezone}
          currency={currency}
          coopSlug={slug}
          showMember
          canReverse={mayRecord}
          sortable={['occurred_at', 'quantity', 'total']}
          pageInfo={{ page: draws.page, pageSize: draws.pageSize, total: draws.total }}
        />
      </>
    );
  } else {
    const parsed = reservationListSchema.safeParse({ ...base, ...filters });
    if (!parsed.success) filterError = 'Some filters were not understood and were ignored.';
    const q = parsed.success ? parsed.data : reservationListSchema.parse({});
    const res = await listReservations(actor, q);
    content = (
      <ReservationsTable
        rows={res.items.map((r) => ({ ...r, canCancel: mayRecord }))}
        units={units}
        timeZone={timezone}
        coopSlug={slug}
        showMember
        sortable={['created_at', 'window_end', 'quantity', 'status']}
        pageInfo={{ page: res.page, pageSize: res.pageSize, total: res.total }}
      />
    );
  }
  const statuses = view === 'draws' ? DRAW_STATUSES : RESERVATION_STATUSES;
  const tab = (v: string, label: string) => (
    <Link
      href={`/c/${slug}/draws?view=${v}`}
      aria-current={view === v ? 'page' : undefined}
      className={`rounded-t-lg border-b-4 px-4 py-2 font-semibold no-underline ${view === v ? 'border-amber-400 text-fir-900' : 'border-transparent text-stone-700 hover:text-fir-900'}`}
    >
      {label}
    </Link>
  );

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1>Draws and reservations</h1>
        <p className="text-stone-600">
          Every draw keeps the price in force when it was recorded. Mistakes are corrected with a reversing entry, never
          by editing.
        </p>
      </div>
      {mayRecord ? (
        <Card title="Record a draw">
          {!policy ? (
            <Notice tone="warn">
              No member price is set yet; the treasurer sets it on the{' '}
              <Link className="underline" href={`/c/${slug}/tank/pricing`}>
                pricing page
              </Link>{' '}
              first.
            </Notice>
          ) : null}
          {tanks.some((t) => t.active) ? (
            <RecordDrawForm
              coopSlug={slug}
              units={units}
              currency={currency}
              tanks={tanks.filter((t) => t.active)}
              members={members}
              lastMeter={lastMeter}
              reservations={openRes?.items ?? []}
            />
          ) : (
            <p className="text-stone-700">No tank is in service.</p>
          )}
        </Card>
      ) : null}

      <section aria-labelledby="list" className="flex flex-col gap-3">
        <h2 id="list" className="sr-only">
          {view === 'draws' ? 'Draws' : 'Reservations'}
        </h2>
        <nav aria-label="Draws or reservations" className="flex gap-1 border-b border-stone-200">
          {tab('draws', 'Draws')}
          {tab('reservations', 'Reservations')}
        </nav>
        <form
          method="get"
          className="grid gap-3 rounded-xl border border-stone-200 bg-white p-3 sm:grid-cols-3 lg:grid-cols-6"
          aria-label="Filters"
        >
          <input type="hidden" name="view" value={view} />
          <label className="flex flex-col gap-1 text-sm font-medium text-stone-800">
            Member
            <select
              name="membershipId"
              defaultValue={filters.membershipId ?? ''}
              className="min-h-11 rounded-lg border border-stone-300 bg-white px-2 text-base font-normal"
            >
              <option value="">Everyone</option>
              {members.map((m) => (
                <option key={m.membershipId} value={m.membershipId}>
                  {m.name}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1 text-sm font-medium text-stone-800">
            Tank
            <select
              name="tankId"
              defaultValue={filters.tankId ?? ''}
              className="min-h-11 rounded-lg border border-stone-300 bg-white px-2 text-base font-normal"
            >
              <option value="">All tanks</option>
              {tanks.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1 text-sm font-medium text-stone-800">
            Status
            <select
              name="status"
              defaultValue={filters.status ?? ''}
              className="min-h-11 rounded-lg border border-stone-300 bg-white px-2 text-base font-normal"
            >
              <option value="">Any</option>
              {statuses.map((s) => (
                <option key={s} value={s}>
                  {s}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1 text-sm font-medium text-stone-800">
            From
            <input
              type="date"
              name="from"
              defaultValue={filters.from ?? ''}
              className="min-h-11 rounded-lg border border-stone-300 bg-white px-2 text-base font-normal"
            />
          </label>
          <label className="flex flex-col gap-1 text-sm font-medium text-stone-800">
            To
            <input
              type="date"
              name="to"
              defaultValue={filters.to ?? ''}
              className="min-h-11 rounded-lg border border-stone-300 bg-white px-2 text-base font-normal"
            />
          </label>
          <div className="flex items-end gap-2">
            <button
              type="submit"
              className="min-h-11 rounded-lg bg-fir-700 px-4 text-sm font-semibold text-white hover:bg-fir-800"
            >
              Filter
            </button>
            <Link href={`/c/${slug}/draws?view=${view}`} className="inline-flex min-h-11 items-center px-2 text-sm">
              Clear
            </Link>
          </div>
        </form>
        {filterError ? <Notice tone="warn">{filterError}</Notice> : null}
        {content}
      </section>
    </div>
  );
}
