import 'server-only';
import { QueryTypes } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { can } from '@/lib/auth';
import { ttlMemo } from '@/lib/cache/ttl-memo';
import { runReadPlan, sequelize, statement, type Read, type ReadPlan } from '@/lib/db';
import { memberPriceCentsPerGallon } from '@/lib/pricing';
import { policyInForce } from '@/lib/pricing-policy';
import type { PolicyRow } from '@/lib/pricing-policy/convert';
import { listTanks, type TankDto } from '@/lib/tank';
import { mlToLiters } from '@/lib/tank/quantity';
import { policyInUnits } from '@/lib/pricing-policy/convert';
import { LITERS_PER_US_GALLON } from '@/lib/units';

import { MEMBER_BALANCE, memberBalanceOf } from '@/lib/billing/invoices';
import { currentPeriod, periodToDate } from '@/lib/billing/periods';
import { BATCH_NEEDS, batchNeedsOf, STOCK_TOTALS, stockTotalsOf, summarizeStock, type BatchNeedsRow, type StockTotalsRow } from '@/lib/supplies';
import type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection } from './types';

export type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection };

const q = <T extends object>(sql: string, replacements: Record<string, unknown>) => sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });


/**
 * Tank totals across the co-op's active tanks, with the moving-average cost per gallon, from
 * lib/tank's list (read with its statement, so lapsed reservations are released first, exactly
 * as on the tank page); sums are taken in whole millilitres.
 */
export function tankSummaryOf(tanks: TankDto[]): TankSummary {
  const sumMl = (k: 'onHandLiters' | 'reservedLiters' | 'capacityLiters') => tanks.reduce((a, t) => a + Math.round(t[k] * 1000), 0);
  const onHandMl = sumMl('onHandLiters');
  const reservedMl = sumMl('reservedLiters');
  const valueCents = tanks.reduce((a, t) => a + t.valueCents, 0);
  return {
    onHandLiters: mlToLiters(onHandMl),
    reservedLiters: mlToLiters(reservedMl),
    availableLiters: mlToLiters(onHandMl - reservedMl),
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

const WORKING = `('reacting','settling','draining','washing','drying','testing')`;

type WorkingRow = { id: number; number: number; status: string; oil_liters: string; status_changed_at: Date };
const WORKING_BATCHES = statement(
  `SELECT id, number, status, oil_liters, status_changed_at FROM batches WHERE coop_id = $1 AND status IN ${WORKING} ORDER BY number LIMIT 10`,
  'tv_overview_working',
);

/** Batches under way, the next planned batch, and whether the chemicals it uses are covered. */
function brewerSectionOf(working: WorkingRow[], totals: StockTotalsRow[], needsRow: BatchNeedsRow | undefined): BrewerSection {
  const needs = batchNeedsOf(needsRow);
  const summary = summarizeStock(stockTotalsOf(totals), needs);
  const next = needs.next;
  return {
    inProgress: working.map((b) => ({ id: b.id, number: b.number, status: b.status, oilLiters: Number(b.oil_liters), since: new Date(b.status_changed_at).toISOString() })),
    nextPlanned: next ? { id: next.id, number: next.number, batchDate: next.batchDate, oilLiters: next.oilLiters, catalyst: next.catalyst } : null,
    stock: summary.lines.filter((l) => l.nextPlannedNeed !== null).map((l) => ({ kind: l.kind, unit: l.unit, available: l.available, need: l.nextPlannedNeed!, low: l.low })),
  };
}

/** This month's invoiced / paid / outstanding (issued invoices) and payments waiting to be matched. $2 = the month's first day. */
const MONTH_BILLING = statement(
  `SELECT
     COALESCE(SUM(total_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS invoiced,
     COALESCE(SUM(paid_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS paid,
     COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)) FILTER (WHERE kind = 'invoice' AND status IN ('issued','partly-paid')), 0) AS outstanding,
     COUNT(*) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS invoices,
     COUNT(*) FILTER (WHERE kind = 'invoice' AND status = 'draft') AS drafts,
     (SELECT COUNT(*) FROM payments p WHERE p.coop_id = $1 AND p.unallocated_cents > 0) AS unmatched,
     (SELECT COALESCE(SUM(p.unallocated_cents), 0) FROM payments p WHERE p.coop_id = $1 AND p.unallocated_cents > 0) AS unmatched_cents
   FROM invoices WHERE coop_id = $1 AND period = $2::date`,
  'tv_overview_month_billing',
);

function treasurerSectionOf(period: string, r: Record<string, string> | undefined): TreasurerSection {
  const n = (k: string) => Number(r?.[k] ?? 0);
  return {
    period, invoicedCents: n('invoiced'), paidCents: n('paid'), outstandingCents: n('outstanding'), invoices: n('invoices'), drafts: n('drafts'),
    unmatchedPayments: n('unmatched'), unmatchedCents: n('unmatched_cents'),
  };
}

/**
 * The last 12 released batches' cost per US gallon by kind, from the costs stored at release
 * (cents ÷ gallons released), oldest first.
 */
export async function getBatchCosts(coopId: number, timeZone: string): Promise<BatchCost[]> {
  const rows = await q<Record<string, string | number>>(
    `SELECT number, to_char(released_at AT TIME ZONE :tz, 'YYYY-MM-DD') AS released_on, released_liters,
            cost_methanol_cents * :lpg / released_liters AS methanol, cost_catalyst_cents * :lpg / released_liters AS catalyst,
            cost_energy_cents * :lpg / released_liters AS energy, cost_feedstock_cents * :lpg / released_liters AS feedstock,
            cost_other_cents * :lpg / released_liters AS other, total_cost_cents * :lpg / released_liters AS total
     FROM batches WHERE coop_id = :c AND status = 'released' ORDER BY number DESC LIMIT 12`,
    { c: coopId, tz: timeZone, lpg: LITERS_PER_US_GALLON },
  );
  const r2 = (v: unknown) => Math.round(Number(v) * 100) / 100;
  return rows.reverse().map((b) => ({
    number: Number(b.number), releasedOn: String(b.released_on), releasedLiters: Number(b.released_liters),
    methanol: r2(b.methanol), catalyst: r2(b.catalyst), energy: r2(b.energy), feedstock: r2(b.feedstock), other: r2(b.other), totalCentsPerGallon: r2(b.total),
  }));
}

/** Members owing the most on issued invoices (top 10), how many owe anything, and the total. */
export async function getBalances(coopId: number): Promise<NonNullable<Overview['balances']>> {
  const rows = await q<{ membership_id: number; name: string; outstanding: string; members: string; total: string }>(
    `WITH owing AS (
       SELECT membership_id, SUM(GREATEST(total_cents - paid_cents, 0)) AS outstanding FROM invoices
       WHERE coop_id = :c AND kind = 'invoice' AND status IN ('issued','partly-paid') GROUP BY membership_id HAVING SUM(GREATEST(total_cents - paid_cents, 0)) > 0
     ), totals AS (SELECT COUNT(*) AS members, COALESCE(SUM(outstanding), 0) AS total FROM owing)
     SELECT o.membership_id, u.name, o.outstanding, totals.members, totals.total
     FROM totals LEFT JOIN LATERAL (SELECT * FROM owing ORDER BY outstanding DESC, membership_id LIMIT 10) o ON true
     LEFT JOIN memberships m ON m.id = o.membership_id AND m.coop_id = :c LEFT JOIN users u ON u.id = m.user_id
     ORDER BY o.outstanding DESC NULLS LAST, o.membership_id`,
    { c: coopId },
  );
  const first = rows[0];
  return {
    topOwing: rows.filter((r) => r.membership_id !== null).map((r) => ({ membershipId: r.membership_id, name: r.name ?? 'Former member', outstandingCents: Number(r.outstanding) })),
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

const MY_RESERVATIONS = statement(
  `SELECT r.id, t.name AS tank_name, r.quantity_liters, r.window_end FROM reservations r JOIN tanks t ON t.id = r.tank_id AND t.coop_id = r.coop_id
   WHERE r.coop_id = $1 AND r.membership_id = $2 AND r.status = 'open' AND r.window_end >= now() ORDER BY r.window_end LIMIT 10`,
  'tv_overview_my_reservations',
);
const INVITATIONS = statement(
  `SELECT COUNT(*) FILTER (WHERE status = 'pending' AND expires_at > now()) AS pending,
          COUNT(*) FILTER (WHERE status = 'pending' AND expires_at > now() AND delivery = 'not-sent') AS not_sent
   FROM invitations WHERE coop_id = $1`,
  'tv_overview_invitations',
);
const RECENT_EVENTS = statement(
  `SELECT e.created_at, u.name, e.action FROM audit_events e LEFT JOIN users u ON u.id = e.actor_user_id
   WHERE e.coop_id = $1 ORDER BY e.created_at DESC, e.id DESC LIMIT 8`,
  'tv_overview_recent_events',
);

/** The chart series, from the per-process cache (read on a miss). */
function charts(actor: Actor) {
  const c = actor.coop.id;
  const tz = actor.coop.timezone;
  const isBrewer = can(actor.role, 'batches:read-all');
  const isTreasurer = can(actor.role, 'billing:manage');
  return Promise.all([
    chartCache(`volumes:${c}:${tz}`, () => q<{ month: string; released: string; drawn: string }>(
      `WITH months AS (
         SELECT generate_series(date_trunc('month', now() AT TIME ZONE :tz) - interval '11 months', date_trunc('month', now() AT TIME ZONE :tz), interval '1 month') AS m
       ), since AS (SELECT (MIN(m) AT TIME ZONE :tz) AS lo FROM months),
       rel AS (
         SELECT date_trunc('month', t.occurred_at AT TIME ZONE :tz) AS m, SUM(t.quantity_liters) AS q
         FROM tank_movements t, since WHERE t.coop_id = :c AND t.kind = 'release' AND t.occurred_at >= since.lo GROUP BY 1
       ),
       dr AS (
         SELECT date_trunc('month', d.occurred_at AT TIME ZONE :tz) AS m, SUM(d.quantity_liters) AS q
         FROM draws d, since WHERE d.coop_id = :c AND d.occurred_at >= since.lo GROUP BY 1
       )
       SELECT to_char(months.m, 'YYYY-MM') AS month, COALESCE(rel.q, 0) AS released, COALESCE(dr.q, 0) AS drawn
       FROM months LEFT JOIN rel ON rel.m = months.m LEFT JOIN dr ON dr.m = months.m ORDER BY months.m`,
      { c, tz },
    )),
    chartCache(`level:${c}:${tz}`, () => q<{ day: string; on_hand: string }>(
      `WITH days AS (
         SELECT generate_series((now() AT TIME ZONE :tz)::date - 89, (now() AT TIME ZONE :tz)::date, interval '1 day')::date AS d
       )
       SELECT to_char(days.d, 'YYYY-MM-DD') AS day, COALESCE(SUM(x.on_hand_after_liters), 0) AS on_hand
       FROM days CROSS JOIN tanks t
       LEFT JOIN LATERAL (
         SELECT m.on_hand_after_liters FROM tank_movements m
         WHERE m.coop_id = :c AND m.tank_id = t.id AND m.occurred_at < ((days.d + 1)::timestamp AT TIME ZONE :tz)
         ORDER BY m.occurred_at DESC, m.id DESC LIMIT 1
       ) x ON true
       WHERE t.coop_id = :c AND t.active
       GROUP BY days.d ORDER BY days.d`,
      { c, tz },
    )),
    isBrewer || can(actor.role, 'reports:read') ? chartCache(`costs:${c}:${tz}`, () => getBatchCosts(c, tz)) : null,
    isTreasurer ? chartCache(`balances:${c}`, () => getBalances(c)) : null,
  ]);
}

/**
 * The first screen of a co-op, different by role: everyone sees the tank and the price; members
 * their open reservations; admins pending invitations and recent changes. The figures on its
 * cards are read fresh on every request, in one message (the route sends it with the session
 * check); chart series are SQL aggregates (months in the co-op's time zone), never rows loaded
 * into JavaScript, kept per process for a minute.
 */
export function overviewPlan(actor: Actor): ReadPlan<Overview> {
  const c = actor.coop.id;
  const isBrewer = can(actor.role, 'batches:read-all');
  const isTreasurer = can(actor.role, 'billing:manage');
  const isAdmin = can(actor.role, 'members:manage');
  const period = currentPeriod(actor.coop.timezone);
  const reads: Read[] = [
    [MY_RESERVATIONS, [c, actor.membershipId]],
    [MEMBER_BALANCE, [c, actor.membershipId]],
    ...(isAdmin ? ([[INVITATIONS, [c]], [RECENT_EVENTS, [c]]] as Read[]) : []),
    ...(isBrewer ? ([[WORKING_BATCHES, [c]], [STOCK_TOTALS, [c, ['methanol', 'KOH', 'NaOH']]], [BATCH_NEEDS, [c]]] as Read[]) : []),
    ...(isTreasurer ? ([[MONTH_BILLING, [c, periodToDate(period)]]] as Read[]) : []),
  ];
  return {
    reads,
    finish: async (sets) => {
      const [reservations, [balance], ...rest] = sets as [ReservationRow[], [BalanceRow | undefined], ...unknown[][]];
      const [tanks, policy] = await Promise.all([listTanks(actor, { activeOnly: true }), policyInForce(c)]);
      const take = <T>() => rest.shift() as T;
      const admin = isAdmin ? { invitations: take<InvitationRow[]>(), events: take<EventRow[]>() } : null;
      const brewer = isBrewer ? brewerSectionOf(take<WorkingRow[]>(), take<StockTotalsRow[]>(), take<BatchNeedsRow[]>()[0]) : null;
      const treasurer = isTreasurer ? treasurerSectionOf(period, take<Record<string, string>[]>()[0]) : null;
      const tank = tankSummaryOf(tanks);
      const [volumes, level, batchCosts, balances] = await charts(actor);
      return {
        role: actor.role,
        tank,
        price: priceSummaryOf(policy ?? undefined, tank.avgCostCentsPerGallon),
        volumes: volumes.map((v) => ({ month: v.month, releasedLiters: Number(v.released), drawnLiters: Number(v.drawn) })),
        tankLevel: level.map((l) => ({ day: l.day, onHandLiters: Number(l.on_hand) })),
        member: {
          openReservations: reservations.map((r) => ({ id: r.id, tankName: r.tank_name, quantityLiters: r.quantity_liters, windowEnd: new Date(r.window_end).toISOString() })),
        },
        account: memberBalanceOf(balance),
        ...(brewer ? { brewer } : {}),
        ...(treasurer ? { treasurer } : {}),
        ...(batchCosts ? { batchCosts } : {}),
        ...(balances ? { balances } : {}),
        ...(admin
          ? {
              admin: {
                pendingInvitations: Number(admin.invitations[0]?.pending ?? 0),
                notSentInvitations: Number(admin.invitations[0]?.not_sent ?? 0),
                recentEvents: admin.events.map((e) => ({ at: new Date(e.created_at).toISOString(), who: e.name, action: e.action })),
              },
            }
          : {}),
      };
    },
  };
}

type ReservationRow = { id: number; tank_name: string; quantity_liters: string; window_end: Date };
type BalanceRow = { outstanding: string; credit: string; unallocated: string };
type InvitationRow = { pending: string; not_sent: string };
type EventRow = { created_at: Date; name: string | null; action: string };

/** The overview on its own (for the page; see {@link overviewPlan}). */
export function getOverview(actor: Actor): Promise<Overview> {
  return runReadPlan(overviewPlan(actor));
}
