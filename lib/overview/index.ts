import 'server-only';
import { QueryTypes } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { can } from '@/lib/auth';
import { sequelize } from '@/lib/db';
import { memberPriceCentsPerGallon, type PricingPolicy } from '@/lib/pricing';
import { LITERS_PER_US_GALLON } from '@/lib/units';

import type { MonthVolume, Overview, PriceSummary, TankSummary } from './types';

export type { MonthVolume, Overview, PriceSummary, TankSummary };

const q = <T extends object>(sql: string, replacements: Record<string, unknown>) => sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });


/** Tank totals across the co-op's active tanks, with the moving-average cost per gallon. */
export async function getTankSummary(coopId: number): Promise<TankSummary> {
  const [t] = await q<{ on_hand: string; reserved: string; capacity: string; value: string; n: string }>(
    `SELECT COALESCE(SUM(on_hand_liters),0) AS on_hand, COALESCE(SUM(reserved_liters),0) AS reserved,
            COALESCE(SUM(capacity_liters),0) AS capacity, COALESCE(SUM(value_cents),0) AS value, COUNT(*) AS n
     FROM tanks WHERE coop_id = :coopId AND active`,
    { coopId },
  );
  const onHand = Number(t!.on_hand);
  return {
    onHandLiters: onHand.toFixed(3),
    reservedLiters: Number(t!.reserved).toFixed(3),
    availableLiters: (onHand - Number(t!.reserved)).toFixed(3),
    capacityLiters: Number(t!.capacity).toFixed(3),
    avgCostCentsPerGallon: onHand > 0 ? Math.round((Number(t!.value) / onHand) * LITERS_PER_US_GALLON) : null,
    tanks: Number(t!.n),
  };
}

/** The member price in force now, from the latest policy and the tanks' average cost. */
export async function getPriceSummary(coopId: number, avgCostCentsPerGallon: number | null): Promise<PriceSummary | null> {
  const [p] = await q<{ kind: PricingPolicy['kind']; price: string | null; margin: string | null; pct: string | null; surcharge: string; tax: string }>(
    `SELECT kind, price_cents_per_gallon AS price, margin_cents_per_gallon AS margin, margin_pct AS pct,
            surcharge_cents_per_gallon AS surcharge, road_tax_cents_per_gallon AS tax
     FROM price_policies WHERE coop_id = :coopId AND effective_from <= now() ORDER BY effective_from DESC, id DESC LIMIT 1`,
    { coopId },
  );
  if (!p) return null;
  const extra = { surchargeCentsPerGallon: Number(p.surcharge), roadTaxCentsPerGallon: Number(p.tax) };
  const policy: PricingPolicy =
    p.kind === 'fixed' ? { kind: 'fixed', priceCents: Math.round(Number(p.price)), ...extra }
    : p.kind === 'cost-plus-amount' ? { kind: 'cost-plus-amount', marginCents: Math.round(Number(p.margin)), ...extra }
    : { kind: 'cost-plus-percent', marginPct: Number(p.pct), ...extra };
  if (policy.kind !== 'fixed' && avgCostCentsPerGallon === null) return null;
  const b = memberPriceCentsPerGallon(policy, avgCostCentsPerGallon, 'off-road');
  return { kind: p.kind, centsPerGallon: b.totalCents, roadTaxCentsPerGallon: Number(p.tax) };
}

/**
 * The first screen of a co-op, different by role: everyone sees the tank and the price; members
 * their open reservations; admins pending invitations and recent changes. Chart series are SQL
 * aggregates (months in the co-op's time zone), never rows loaded into JavaScript.
 */
export async function getOverview(actor: Actor): Promise<Overview> {
  const c = actor.coop.id;
  const tz = actor.coop.timezone;
  const tank = await getTankSummary(c);
  const [price, volumes, level, reservations, admin] = await Promise.all([
    getPriceSummary(c, tank.avgCostCentsPerGallon),
    q<{ month: string; released: string; drawn: string }>(
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
    ),
    q<{ day: string; on_hand: string }>(
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
    ),
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
