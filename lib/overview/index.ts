import 'server-only';
import { col, fn, literal, Op, type InferAttributes } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { can } from '@/lib/auth';
import { OPEN_STATUSES } from '@/lib/billing/status';
import { currentPeriod, periodToDate } from '@/lib/billing/periods';
import { ttlMemo } from '@/lib/cache/ttl-memo';
import { memberPriceCentsPerGallon } from '@/lib/pricing';
import { policyInUnits, type PolicyRow } from '@/lib/tank/pricing-policy/convert';
import { stockPictureParams, stockStateOf, summarizeStock } from '@/lib/supplies/stock';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { tankAvailableMl } from '@/lib/tank/volume';
import { LITERS_PER_US_GALLON } from '@/lib/units';
import { qualityOf } from '@/lib/brewing';
import { Batch } from '@/models';
import { dailyTankLevel, monthlyVolumes, overviewCards, topOwing, type CardsRow } from './queries';
import type {
  BatchCost,
  BrewerSection,
  MonthVolume,
  Overview,
  PriceSummary,
  TankSummary,
  TreasurerSection,
} from './types';

export type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection };

/**
 * Tank totals across the co-op's active tanks (the same figures as the tank page: each tank's
 * available by lib/tank's rule, then summed), with the moving-average cost per gallon; whole
 * millilitres.
 */
export function tankSummaryOf(tanks: CardsRow['tanks']): TankSummary {
  let onHandMl = 0;
  let reservedMl = 0;
  let heldMl = 0;
  let availableMl = 0;
  let capacityMl = 0;
  let valueCents = 0;
  for (const t of tanks) {
    const [onHand, reserved, held] = [litersToMl(t.onHand), litersToMl(t.reserved), litersToMl(t.held)];
    onHandMl += onHand;
    reservedMl += reserved;
    heldMl += held;
    availableMl += tankAvailableMl(onHand, reserved, held);
    capacityMl += litersToMl(t.capacity);
    valueCents += Number(t.value);
  }
  return {
    onHandLiters: mlToLiters(onHandMl),
    reservedLiters: mlToLiters(reservedMl),
    heldLiters: mlToLiters(heldMl),
    availableLiters: mlToLiters(availableMl),
    capacityLiters: mlToLiters(capacityMl),
    avgCostCentsPerGallon: onHandMl > 0 ? Math.round((valueCents / (onHandMl / 1000)) * LITERS_PER_US_GALLON) : null,
    tanks: tanks.length,
  };
}

/** The member price in force now, from the latest policy and the tanks' average cost. */
export function priceSummaryOf(
  row: PolicyRow | null | undefined,
  avgCostCentsPerGallon: number | null,
): PriceSummary | null {
  if (!row) return null;
  const policy = policyInUnits(row, 'us');
  if (policy.kind !== 'fixed' && avgCostCentsPerGallon === null) return null;
  const b = memberPriceCentsPerGallon(policy, avgCostCentsPerGallon, 'off-road');
  return { kind: policy.kind, centsPerGallon: b.totalCents, roadTaxCentsPerGallon: policy.roadTaxCentsPerGallon ?? 0 };
}

/** A batch's verdict in the one wording (lib/brewing qualityOf). */
const verdict = (b: Parameters<typeof qualityOf>[0]) => {
  const { text, kind } = qualityOf(b);
  return { text, kind };
};

/** Batch steps between planned and released: the work under way. */
const WORKING = ['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;

/** Batches under way (from the cards row) with their verdicts, the latest released ones, the next planned batch, and whether the chemicals it uses are covered. */
function brewerSectionOf(
  working: NonNullable<CardsRow['working']>,
  released: NonNullable<CardsRow['released']>,
  { lots, needs }: ReturnType<typeof stockStateOf>,
): BrewerSection {
  const summary = summarizeStock(lots, needs);
  const next = needs.next;
  return {
    inProgress: working.map((b) => ({
      id: b.id,
      number: b.number,
      status: b.status,
      oilLiters: Number(b.oilLiters),
      since: new Date(b.since).toISOString(),
      quality: verdict(b),
    })),
    recentReleased: released.map((b) => ({
      id: b.id,
      number: b.number,
      releasedAt: new Date(b.releasedAt).toISOString(),
      releasedLiters: Number(b.releasedLiters),
      quality: verdict(b),
    })),
    nextPlanned: next
      ? {
          id: next.id,
          number: next.number,
          batchDate: next.batchDate,
          oilLiters: next.oilLiters,
          catalyst: next.catalyst,
        }
      : null,
    stock: summary.lines
      .filter((l) => l.nextPlannedNeed !== null)
      .map((l) => ({ kind: l.kind, unit: l.unit, available: l.available, need: l.nextPlannedNeed!, low: l.low })),
  };
}

/**
 * This month's invoiced / paid / outstanding (issued invoices: not draft, not void; outstanding
 * only on issued and partly paid ones), its drafts, and payments of any month with money not yet
 * matched to an invoice.
 */
function treasurerSectionOf(
  period: string,
  sums: NonNullable<CardsRow['invoiceSums']>,
  unmatched: CardsRow['unmatched'],
): TreasurerSection {
  type Sum = (typeof sums)[number];
  const issued = sums.filter((r) => r.kind === 'invoice' && r.status !== 'draft' && r.status !== 'void');
  const add = (rows: Sum[], k: 'count' | 'total' | 'paid' | 'owed') => rows.reduce((a, r) => a + Number(r[k] ?? 0), 0);
  return {
    period,
    invoicedCents: add(issued, 'total'),
    paidCents: add(issued, 'paid'),
    outstandingCents: add(
      issued.filter((r) => (OPEN_STATUSES as string[]).includes(r.status)),
      'owed',
    ),
    invoices: add(issued, 'count'),
    drafts: add(
      sums.filter((r) => r.kind === 'invoice' && r.status === 'draft'),
      'count',
    ),
    unmatchedPayments: Number(unmatched?.count ?? 0),
    unmatchedCents: Number(unmatched?.cents ?? 0),
  };
}

/**
 * The last 12 finished batches' (released, or imported with costs) cost per US gallon by kind, from the costs stored at release
 * (cents ÷ gallons released, in SQL's exact NUMERIC), oldest first; the release day in the co-op's
 * time zone.
 */
export async function getBatchCosts(coopId: number, timeZone: string): Promise<BatchCost[]> {
  const perGallon = (column: string) => literal(`${column} * ${LITERS_PER_US_GALLON} / released_liters`);
  const rows = (await Batch.findAll({
    attributes: [
      'number',
      'releasedLiters',
      [fn('to_char', fn('timezone', timeZone, col('released_at')), 'YYYY-MM-DD'), 'releasedOn'],
      [perGallon('cost_methanol_cents'), 'methanol'],
      [perGallon('cost_catalyst_cents'), 'catalyst'],
      [perGallon('cost_energy_cents'), 'energy'],
      [perGallon('cost_feedstock_cents'), 'feedstock'],
      [perGallon('cost_other_cents'), 'other'],
      [perGallon('total_cost_cents'), 'total'],
    ],
    // Imported past batches count when their costs were recorded.
    where: { coopId, [Op.or]: [{ status: 'released' }, { status: 'imported', totalCostCents: { [Op.ne]: null } }] },
    order: [['number', 'DESC']],
    limit: 12,
    raw: true,
  })) as unknown as (Pick<InferAttributes<Batch>, 'number' | 'releasedLiters'> &
    Record<'releasedOn' | 'methanol' | 'catalyst' | 'energy' | 'feedstock' | 'other' | 'total', string>)[];
  const r2 = (v: unknown) => Math.round(Number(v) * 100) / 100;
  return rows.reverse().map((b) => ({
    number: b.number,
    releasedOn: b.releasedOn,
    releasedLiters: Number(b.releasedLiters),
    methanol: r2(b.methanol),
    catalyst: r2(b.catalyst),
    energy: r2(b.energy),
    feedstock: r2(b.feedstock),
    other: r2(b.other),
    totalCentsPerGallon: r2(b.total),
  }));
}

/** Members owing the most on issued invoices (top 10), how many owe anything, and the total. */
export async function getBalances(coopId: number): Promise<NonNullable<Overview['balances']>> {
  const rows = await topOwing(coopId);
  const first = rows[0];
  return {
    topOwing: rows.flatMap((r) =>
      r.membershipId === null
        ? []
        : [{ membershipId: r.membershipId, name: r.name ?? 'Former member', outstandingCents: Number(r.outstanding) }],
    ),
    membersOwing: Number(first?.members ?? 0),
    totalOutstandingCents: Number(first?.total ?? 0),
  };
}

/**
 * The chart series (12-month volumes, 90-day tank level, batch costs, balances owed) aggregate
 * tens of thousands of rows (≈30 ms of database time on the benchmark co-op), so each co-op's
 * series are kept for CHART_TTL_MS in this process. Only a speed-up: figures on cards (tank,
 * price, my balance, the month's billing) are always read fresh, and a chart is at most a
 * minute behind. Each app instance keeps its own copy; nothing depends on it.
 */
/** OVERVIEW_CACHE_SECONDS (default 60; the tests set 0 so every read is exact). */
const CHART_TTL_MS = Number(process.env.OVERVIEW_CACHE_SECONDS ?? 60) * 1000;
const chartCache = ttlMemo(CHART_TTL_MS);

/** The chart series, from the per-process cache (read on a miss). */
function charts(actor: Actor) {
  const c = actor.coop.id;
  const tz = actor.coop.timezone;
  const isBrewer = can(actor.role, 'batches:read-all');
  const isTreasurer = can(actor.role, 'billing:manage');
  return Promise.all([
    chartCache(`volumes:${c}:${tz}`, () => monthlyVolumes(c, tz)),
    chartCache(`level:${c}:${tz}`, () => dailyTankLevel(c, tz)),
    isBrewer || can(actor.role, 'reports:read') ? chartCache(`costs:${c}:${tz}`, () => getBatchCosts(c, tz)) : null,
    isTreasurer ? chartCache(`balances:${c}`, () => getBalances(c)) : null,
  ]);
}

/**
 * The first screen of a co-op, different by role: everyone sees the tank and the price, their
 * open reservations and their own account; brewers the batches under way and the stock for the
 * next one, with the batches' quality verdicts; treasurers the month's billing; admins pending
 * invitations and recent changes. Every card figure is one statement (overviewCards: the tank
 * totals, the price policy in force, my reservations and account, and the sections of my role,
 * brewers' chemical stock included), read fresh on every request, beside the chart series; the
 * batches' quality verdicts are judged by lib/brewing qualityOf from columns the cards statement
 * reads. Chart series are SQL aggregates (months in the co-op's time zone), never rows loaded into
 * JavaScript, kept per process for a minute. Reads only: nothing is written.
 * @param actor any member (coop:read)
 */
export async function getOverview(actor: Actor): Promise<Overview> {
  const c = actor.coop.id;
  const isBrewer = can(actor.role, 'batches:read-all');
  const isTreasurer = can(actor.role, 'billing:manage');
  const isAdmin = can(actor.role, 'members:manage');
  const period = currentPeriod(actor.coop.timezone);
  const [cards, [volumes, level, batchCosts, balances]] = await Promise.all([
    overviewCards({
      coopId: c,
      membershipId: actor.membershipId,
      working: WORKING,
      stock: stockPictureParams(c, { totals: true }),
      period: periodToDate(period),
      brewer: isBrewer,
      treasurer: isTreasurer,
      admin: isAdmin,
    }),
    charts(actor),
  ]);
  const openReservations = cards.reservations.map((r) => ({ ...r, windowEnd: new Date(r.windowEnd).toISOString() }));
  const account = {
    outstandingCents: Number(cards.outstandingCents),
    creditCents: Number(cards.creditCents),
    unallocatedCents: Number(cards.unallocatedCents),
  };
  const brewer =
    cards.working && cards.released && cards.stock
      ? brewerSectionOf(cards.working, cards.released, stockStateOf(cards.stock))
      : null;
  const treasurer = cards.invoiceSums ? treasurerSectionOf(period, cards.invoiceSums, cards.unmatched) : null;
  const admin =
    cards.invitations && cards.events
      ? {
          pendingInvitations: Number(cards.invitations.pending),
          notSentInvitations: Number(cards.invitations.notSent),
          recentEvents: cards.events.map((e) => ({ at: new Date(e.at).toISOString(), who: e.who, action: e.action })),
        }
      : null;
  const tank = tankSummaryOf(cards.tanks);
  return {
    role: actor.role,
    tank,
    price: priceSummaryOf(cards.policy, tank.avgCostCentsPerGallon),
    volumes: volumes.map((v) => ({ month: v.month, releasedLiters: Number(v.released), drawnLiters: Number(v.drawn) })),
    tankLevel: level.map((l) => ({ day: l.day, onHandLiters: Number(l.onHand) })),
    member: { openReservations },
    account,
    ...(brewer ? { brewer } : {}),
    ...(treasurer ? { treasurer } : {}),
    ...(batchCosts ? { batchCosts } : {}),
    ...(balances ? { balances } : {}),
    ...(admin ? { admin } : {}),
  };
}
