import 'server-only';
import { col, fn, literal, Op, type InferAttributes } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { can } from '@/lib/auth';
import { memberBalance } from '@/lib/billing/invoices';
import { currentPeriod, periodToDate } from '@/lib/billing/periods';
import { ttlMemo } from '@/lib/cache/ttl-memo';
import { memberPriceCentsPerGallon } from '@/lib/pricing';
import { policyInForce } from '@/lib/pricing-policy';
import { policyInUnits, type PolicyRow } from '@/lib/pricing-policy/convert';
import { stockState, summarizeStock } from '@/lib/supplies';
import { listTanks, type TankDto } from '@/lib/tank';
import { mlToLiters } from '@/lib/tank/quantity';
import { LITERS_PER_US_GALLON } from '@/lib/units';
import { AuditEvent, Batch, Invitation, Invoice, Payment, Reservation, Tank, User } from '@/models';
import { dailyTankLevel, monthlyVolumes, topOwing } from './queries';
import type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection } from './types';

export type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection };

/**
 * Tank totals across the co-op's active tanks, with the moving-average cost per gallon, from
 * lib/tank's list (the same figures as the tank page); sums are taken in whole millilitres.
 */
export function tankSummaryOf(tanks: TankDto[]): TankSummary {
  const sumMl = (k: 'onHandLiters' | 'reservedLiters' | 'capacityLiters') => tanks.reduce((a, t) => a + Math.round(t[k] * 1000), 0);
  const onHandMl = sumMl('onHandLiters');
  const reservedMl = sumMl('reservedLiters');
  const availableMl = tanks.reduce((a, t) => a + Math.round(t.availableLiters * 1000), 0);
  const valueCents = tanks.reduce((a, t) => a + t.valueCents, 0);
  return {
    onHandLiters: mlToLiters(onHandMl),
    reservedLiters: mlToLiters(reservedMl),
    availableLiters: mlToLiters(availableMl),
    capacityLiters: mlToLiters(sumMl('capacityLiters')),
    avgCostCentsPerGallon: onHandMl > 0 ? Math.round((valueCents / (onHandMl / 1000)) * LITERS_PER_US_GALLON) : null,
    tanks: tanks.length,
  };
}

/** The member price in force now, from the latest policy and the tanks' average cost. */
export function priceSummaryOf(row: (PolicyRow & { id: number }) | undefined, avgCostCentsPerGallon: number | null): PriceSummary | null {
  if (!row) return null;
  const policy = policyInUnits(row, 'us');
  if (policy.kind !== 'fixed' && avgCostCentsPerGallon === null) return null;
  const b = memberPriceCentsPerGallon(policy, avgCostCentsPerGallon, 'off-road');
  return { kind: policy.kind, centsPerGallon: b.totalCents, roadTaxCentsPerGallon: policy.roadTaxCentsPerGallon ?? 0 };
}


/** Batch steps between planned and released: the work under way. */
const WORKING = ['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;

/** Batches under way, the next planned batch, and whether the chemicals it uses are covered. */
async function getBrewerSection(coopId: number): Promise<BrewerSection> {
  const [working, { lots, needs }] = await Promise.all([
    Batch.findAll({
      attributes: ['id', 'number', 'status', 'oilLiters', 'statusChangedAt'],
      where: { coopId, status: [...WORKING] },
      order: [['number', 'ASC']],
      limit: 10,
      raw: true,
    }),
    stockState(coopId),
  ]);
  const summary = summarizeStock(lots, needs);
  const next = needs.next;
  return {
    inProgress: working.map((b) => ({ id: b.id, number: b.number, status: b.status, oilLiters: Number(b.oilLiters), since: new Date(b.statusChangedAt).toISOString() })),
    nextPlanned: next ? { id: next.id, number: next.number, batchDate: next.batchDate, oilLiters: next.oilLiters, catalyst: next.catalyst } : null,
    stock: summary.lines.filter((l) => l.nextPlannedNeed !== null).map((l) => ({ kind: l.kind, unit: l.unit, available: l.available, need: l.nextPlannedNeed!, low: l.low })),
  };
}

/** Invoices of a month summed per kind and status (a handful of rows); BIGINT sums arrive as strings. */
type InvoiceSums = Pick<InferAttributes<Invoice>, 'kind' | 'status'> & { count: string; total: string | null; paid: string | null; owed: string | null };

/**
 * This month's invoiced / paid / outstanding (issued invoices: not draft, not void; outstanding
 * only on issued and partly paid ones), its drafts, and payments of any month with money not yet
 * matched to an invoice.
 */
async function getTreasurerSection(coopId: number, period: string): Promise<TreasurerSection> {
  const [sums, unmatched] = await Promise.all([
    Invoice.findAll({
      attributes: [
        'kind',
        'status',
        [fn('COUNT', col('id')), 'count'],
        [fn('SUM', col('total_cents')), 'total'],
        [fn('SUM', col('paid_cents')), 'paid'],
        [fn('SUM', fn('GREATEST', literal('total_cents - paid_cents'), 0)), 'owed'],
      ],
      where: { coopId, period: periodToDate(period) },
      group: ['kind', 'status'],
      raw: true,
    }) as unknown as Promise<InvoiceSums[]>,
    Payment.findOne({
      attributes: [
        [fn('COUNT', col('id')), 'count'],
        [fn('COALESCE', fn('SUM', col('unallocated_cents')), 0), 'cents'],
      ],
      where: { coopId, unallocatedCents: { [Op.gt]: 0 } },
      raw: true,
    }) as unknown as Promise<{ count: string; cents: string } | null>,
  ]);
  const issued = sums.filter((r) => r.kind === 'invoice' && r.status !== 'draft' && r.status !== 'void');
  const add = (rows: InvoiceSums[], k: 'count' | 'total' | 'paid' | 'owed') => rows.reduce((a, r) => a + Number(r[k] ?? 0), 0);
  return {
    period,
    invoicedCents: add(issued, 'total'),
    paidCents: add(issued, 'paid'),
    outstandingCents: add(issued.filter((r) => r.status === 'issued' || r.status === 'partly-paid'), 'owed'),
    invoices: add(issued, 'count'),
    drafts: add(sums.filter((r) => r.kind === 'invoice' && r.status === 'draft'), 'count'),
    unmatchedPayments: Number(unmatched?.count ?? 0),
    unmatchedCents: Number(unmatched?.cents ?? 0),
  };
}

/** Pending invitations (and how many of them were never sent) and the last eight audited changes. */
async function getAdminSection(coopId: number): Promise<NonNullable<Overview['admin']>> {
  const [invitations, events] = await Promise.all([
    Invitation.findAll({
      attributes: ['delivery', [fn('COUNT', col('id')), 'count']],
      where: { coopId, status: 'pending', expiresAt: { [Op.gt]: fn('now') } },
      group: ['delivery'],
      raw: true,
    }) as unknown as Promise<(Pick<InferAttributes<Invitation>, 'delivery'> & { count: string })[]>,
    AuditEvent.findAll({
      attributes: ['createdAt', 'action'],
      where: { coopId },
      include: [{ model: User, as: 'actor', attributes: ['name'] }],
      order: [['createdAt', 'DESC'], ['id', 'DESC']],
      limit: 8,
      raw: true,
      nest: true,
    }),
  ]);
  return {
    pendingInvitations: invitations.reduce((a, r) => a + Number(r.count), 0),
    notSentInvitations: invitations.filter((r) => r.delivery === 'not-sent').reduce((a, r) => a + Number(r.count), 0),
    recentEvents: events.map((e) => ({ at: new Date(e.createdAt).toISOString(), who: e.actor?.name ?? null, action: e.action })),
  };
}

/** My open reservations whose window has not ended yet (soonest first), with the tank's name. */
async function myOpenReservations(actor: Actor): Promise<Overview['member']['openReservations']> {
  const rows = await Reservation.findAll({
    attributes: ['id', 'quantityLiters', 'windowEnd'],
    where: { coopId: actor.coop.id, membershipId: actor.membershipId, status: 'open', windowEnd: { [Op.gte]: fn('now') } },
    include: [{ model: Tank, as: 'tank', attributes: ['name'], where: { coopId: actor.coop.id } }],
    order: [['windowEnd', 'ASC']],
    limit: 10,
    raw: true,
    nest: true,
  });
  return rows.map((r) => ({ id: r.id, tankName: r.tank!.name, quantityLiters: r.quantityLiters, windowEnd: new Date(r.windowEnd).toISOString() }));
}

/**
 * The last 12 released batches' cost per US gallon by kind, from the costs stored at release
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
    where: { coopId, status: 'released' },
    order: [['number', 'DESC']],
    limit: 12,
    raw: true,
  })) as unknown as (Pick<InferAttributes<Batch>, 'number' | 'releasedLiters'> & Record<'releasedOn' | 'methanol' | 'catalyst' | 'energy' | 'feedstock' | 'other' | 'total', string>)[];
  const r2 = (v: unknown) => Math.round(Number(v) * 100) / 100;
  return rows.reverse().map((b) => ({
    number: b.number, releasedOn: b.releasedOn, releasedLiters: Number(b.releasedLiters),
    methanol: r2(b.methanol), catalyst: r2(b.catalyst), energy: r2(b.energy), feedstock: r2(b.feedstock), other: r2(b.other), totalCentsPerGallon: r2(b.total),
  }));
}

/** Members owing the most on issued invoices (top 10), how many owe anything, and the total. */
export async function getBalances(coopId: number): Promise<NonNullable<Overview['balances']>> {
  const rows = await topOwing(coopId);
  const first = rows[0];
  return {
    topOwing: rows.flatMap((r) => (r.membershipId === null ? [] : [{ membershipId: r.membershipId, name: r.name ?? 'Former member', outstandingCents: Number(r.outstanding) }])),
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
 * next one; treasurers the month's billing; admins pending invitations and recent changes. The
 * independent reads run in parallel, each a narrow raw query (or another domain's read); the
 * figures on cards are read fresh on every request, chart series are SQL aggregates (months in
 * the co-op's time zone), never rows loaded into JavaScript, kept per process for a minute.
 * Reads only: nothing is written.
 * @param actor any member (coop:read)
 */
export async function getOverview(actor: Actor): Promise<Overview> {
  const c = actor.coop.id;
  const isBrewer = can(actor.role, 'batches:read-all');
  const isTreasurer = can(actor.role, 'billing:manage');
  const isAdmin = can(actor.role, 'members:manage');
  const [tanks, policy, openReservations, account, admin, brewer, treasurer, [volumes, level, batchCosts, balances]] = await Promise.all([
    listTanks(actor, { activeOnly: true }),
    policyInForce(c),
    myOpenReservations(actor),
    memberBalance(c, actor.membershipId),
    isAdmin ? getAdminSection(c) : null,
    isBrewer ? getBrewerSection(c) : null,
    isTreasurer ? getTreasurerSection(c, currentPeriod(actor.coop.timezone)) : null,
    charts(actor),
  ]);
  const tank = tankSummaryOf(tanks);
  return {
    role: actor.role,
    tank,
    price: priceSummaryOf(policy ?? undefined, tank.avgCostCentsPerGallon),
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
