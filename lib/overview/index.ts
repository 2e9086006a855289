import 'server-only';
import { QueryTypes } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { can } from '@/lib/auth';
import { ttlMemo } from '@/lib/cache/ttl-memo';
import { sequelize } from '@/lib/db';
import { memberPriceCentsPerGallon } from '@/lib/pricing';
import { policyInForce } from '@/lib/pricing-policy';
import { listTanks } from '@/lib/tank';
import { mlToLiters } from '@/lib/tank/quantity';
import { policyInUnits } from '@/lib/pricing-policy/convert';
import { LITERS_PER_US_GALLON } from '@/lib/units';

import { memberBalance } from '@/lib/billing/invoices';
import { currentPeriod, periodToDate } from '@/lib/billing/periods';
import { batchNeeds, stockTotals, summarizeStock } from '@/lib/supplies';
import type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection } from './types';

export type { BatchCost, BrewerSection, MonthVolume, Overview, PriceSummary, TankSummary, TreasurerSection };

const q = <T extends object>(sql: string, replacements: Record<string, unknown>) => sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });


/**
 * Tank totals across the co-op's active tanks, with the moving-average cost per gallon. Reads
 * through lib/tank's listTanks so lapsed reservations are released first, exactly as on the
 * tank page; sums are taken in whole millilitres.
 */
export async function getTankSummary(actor: Actor): Promise<TankSummary> {
  const tanks = await listTanks(actor, { activeOnly: true });
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
export async function getPriceSummary(coopId: number, avgCostCentsPerGallon: number | null): Promise<PriceSummary | null> {
  const row = await policyInForce(coopId);
  if (!row) return null;
  const policy = policyInUnits(row, 'us');
  if (policy.kind !== 'fixed' && avgCostCentsPerGallon === null) return null;
  const b = memberPriceCentsPerGallon(policy, avgCostCentsPerGallon, 'off-road');
  return { kind: policy.kind, centsPerGallon: b.totalCents, roadTaxCentsPerGallon: policy.roadTaxCentsPerGallon ?? 0 };
}

const WORKING = `('reacting','settling','draining','washing','drying','testing')`;

/** Batches under way, the next planned batch, and whether the chemicals it uses are covered. */
export async function getBrewerSection(coopId: number): Promise<BrewerSection> {
  const [working, lots, needs] = await Promise.all([
    q<{ id: number; number: number; status: string; oil_liters: string; status_changed_at: Date }>(
      `SELECT id, number, status, oil_liters, status_changed_at FROM batches WHERE coop_id = :c AND status IN ${WORKING} ORDER BY number LIMIT 10`,
      { c: coopId },
    ),
    stockTotals(coopId, ['methanol', 'KOH', 'NaOH']),
    batchNeeds(coopId),
  ]);
  const summary = summarizeStock(lots, needs);
  let nextPlanned: BrewerSection['nextPlanned'] = null;
  if (needs.next) {
    const [n] = await q<{ batch_date: string; oil_liters: string }>(`SELECT to_char(batch_date, 'YYYY-MM-DD') AS batch_date, oil_liters FROM batches WHERE id = :id AND coop_id = :c`, { id: needs.next.id, c: coopId });
    nextPlanned = { id: needs.next.id, number: needs.next.number, batchDate: n?.batch_date ?? '', oilLiters: Number(n?.oil_liters ?? 0), catalyst: needs.next.catalyst };
  }
  return {
    inProgress: working.map((b) => ({ id: b.id, number: b.number, status: b.status, oilLiters: Number(b.oil_liters), since: new Date(b.status_changed_at).toISOString() })),
    nextPlanned,
    stock: summary.lines.filter((l) => l.nextPlannedNeed !== null).map((l) => ({ kind: l.kind, unit: l.unit, available: l.available, need: l.nextPlannedNeed!, low: l.low })),
  };
}

/** This month's invoiced / paid / outstanding (issued invoices) and payments waiting to be matched. */
export async function getTreasurerSection(coopId: number, timeZone: string): Promise<TreasurerSection> {
  const period = currentPeriod(timeZone);
  const [r] = await q<Record<string, string>>(
    `SELECT
       COALESCE(SUM(total_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS invoiced,
       COALESCE(SUM(paid_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS paid,
       COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)) FILTER (WHERE kind = 'invoice' AND status IN ('issued','partly-paid')), 0) AS outstanding,
       COUNT(*) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS invoices,
       COUNT(*) FILTER (WHERE kind = 'invoice' AND status = 'draft') AS drafts,
       (SELECT COUNT(*) FROM payments p WHERE p.coop_id = :c AND p.unallocated_cents > 0) AS unmatched,
       (SELECT COALESCE(SUM(p.unallocated_cents), 0) FROM payments p WHERE p.coop_id = :c AND p.unallocated_cents > 0) AS unmatched_cents
     FROM invoices WHERE coop_id = :c AND period = CAST(:period AS date)`,
    { c: coopId, period: periodToDate(period) },
  );
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

/**
 * The first screen of a co-op, different by role: everyone sees the tank and the price; members
 * their open reservations; admins pending invitations and recent changes. Chart series are SQL
 * aggregates (months in the co-op's time zone), never rows loaded into JavaScript.
 */
export async function getOverview(actor: Actor): Promise<Overview> {
  const c = actor.coop.id;
  const tz = actor.coop.timezone;
  const tank = await getTankSummary(actor);
  const isBrewer = can(actor.role, 'batches:read-all');
  const isTreasurer = can(actor.role, 'billing:manage');
  const [price, volumes, level, reservations, admin, account, brewer, treasurer, batchCosts, balances] = await Promise.all([
    getPriceSummary(c, tank.avgCostCentsPerGallon),
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
    q<{ id: number; tank_name: string; quantity_liters: string; window_end: Date }>(
      `SELECT r.id, t.name AS tank_name, r.quantity_liters, r.window_end FROM reservations r JOIN tanks t ON t.id = r.tank_id AND t.coop_id = r.coop_id
       WHERE r.coop_id = :c AND r.membership_id = :m AND r.status = 'open' AND r.window_end >= now() ORDER BY r.window_end LIMIT 10`,
      { c, m: actor.membershipId },
    ),
    can(actor.role, 'members:manage')
      ? Promise.all([
          q<{ pending: string; not_sent: string }>(
            `SELECT COUNT(*) FILTER (WHERE status = 'pending' AND expires_at > now()) AS pending,
                    COUNT(*) FILTER (WHERE status = 'pending' AND expires_at > now() AND delivery = 'not-sent') AS not_sent
             FROM invitations WHERE coop_id = :c`,
            { c },
          ),
          q<{ created_at: Date; name: string | null; action: string }>(
            `SELECT e.created_at, u.name, e.action FROM audit_events e LEFT JOIN users u ON u.id = e.actor_user_id
             WHERE e.coop_id = :c ORDER BY e.created_at DESC, e.id DESC LIMIT 8`,
            { c },
          ),
        ])
      : null,
    memberBalance(c, actor.membershipId),
    isBrewer ? getBrewerSection(c) : null,
    isTreasurer ? getTreasurerSection(c, tz) : null,
    isBrewer || can(actor.role, 'reports:read') ? chartCache(`costs:${c}:${tz}`, () => getBatchCosts(c, tz)) : null,
    isTreasurer ? chartCache(`balances:${c}`, () => getBalances(c)) : null,
  ]);
  return {
    role: actor.role,
    tank,
    price,
    volumes: volumes.map((v) => ({ month: v.month, releasedLiters: Number(v.released), drawnLiters: Number(v.drawn) })),
    tankLevel: level.map((l) => ({ day: l.day, onHandLiters: Number(l.on_hand) })),
    member: {
      openReservations: reservations.map((r) => ({ id: r.id, tankName: r.tank_name, quantityLiters: r.quantity_liters, windowEnd: new Date(r.window_end).toISOString() })),
    },
    account,
    ...(brewer ? { brewer } : {}),
    ...(treasurer ? { treasurer } : {}),
    ...(batchCosts ? { batchCosts } : {}),
    ...(balances ? { balances } : {}),
    ...(admin
      ? {
          admin: {
            pendingInvitations: Number(admin[0][0]?.pending ?? 0),
            notSentInvitations: Number(admin[0][0]?.not_sent ?? 0),
            recentEvents: admin[1].map((e) => ({ at: new Date(e.created_at).toISOString(), who: e.name, action: e.action })),
          },
        }
      : {}),
  };
}
