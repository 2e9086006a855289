import 'server-only';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/lib/db';
import type { InferAttributes } from 'sequelize';
import { STOCK_PICTURE_COLUMNS, type StockPictureParams, type StockPictureRow } from '@/lib/supplies/queries';
import type { Batch, Invoice, Membership, TankMovement, User } from '@/models';
import type { PolicyRow } from '@/lib/tank/pricing-policy/convert';
import { lapsedLitersSql } from '@/lib/tank/reservations/queries';
import { openStatusSql, outstandingSql } from '@/lib/billing/status';

// The overview's statements a model query can't say: chart series over a calendar made with
// generate_series (months or days with no rows still appear, as zero), the tank level carried
// forward per day, and the top of a grouped aggregate with its totals. Values are always bound.

/** One month of the volume chart: YYYY-MM in the co-op's time zone, litres (NUMERIC strings). */
export interface MonthVolumeRow {
  month: string;
  released: InferAttributes<TankMovement>['quantityLiters'];
  drawn: InferAttributes<TankMovement>['quantityLiters'];
}

/**
 * Litres released into tanks (release movements) and drawn (draws, reversals counting
 * negatively) per calendar month in `timeZone`, for the last 12 months including this one,
 * oldest first.
 */
export function monthlyVolumes(coopId: number, timeZone: string): Promise<MonthVolumeRow[]> {
  return sequelize.query<MonthVolumeRow>(
    `WITH months AS (
       SELECT generate_series(date_trunc('month', now() AT TIME ZONE $tz::text) - interval '11 months',
                              date_trunc('month', now() AT TIME ZONE $tz::text), interval '1 month') AS m
     ), since AS (SELECT (MIN(m) AT TIME ZONE $tz::text) AS lo FROM months),
     rel AS (
       SELECT date_trunc('month', t.occurred_at AT TIME ZONE $tz::text) AS m, SUM(t.quantity_liters) AS q
       FROM tank_movements t, since WHERE t.coop_id = $coopId AND t.kind = 'release' AND t.occurred_at >= since.lo GROUP BY 1
     ),
     dr AS (
       SELECT date_trunc('month', d.occurred_at AT TIME ZONE $tz::text) AS m, SUM(d.quantity_liters) AS q
       FROM draws d, since WHERE d.coop_id = $coopId AND d.occurred_at >= since.lo GROUP BY 1
     )
     SELECT to_char(months.m, 'YYYY-MM') AS month, COALESCE(rel.q, 0) AS released, COALESCE(dr.q, 0) AS drawn
     FROM months LEFT JOIN rel ON rel.m = months.m LEFT JOIN dr ON dr.m = months.m ORDER BY months.m`,
    { bind: { coopId, tz: timeZone }, type: QueryTypes.SELECT },
  );
}

/** One day of the tank-level chart: YYYY-MM-DD in the co-op's time zone, litres on hand at its end. */
export interface DayLevelRow {
  day: string;
  onHand: InferAttributes<TankMovement>['onHandAfterLiters'];
}

/**
 * Fuel on hand across the co-op's active tanks at the end of each of the last 90 days (today
 * included) in `timeZone`: per tank the balance after its last movement before the day ended,
 * from the ledger's (coop_id, tank_id, occurred_at) index, oldest first.
 */
export function dailyTankLevel(coopId: number, timeZone: string): Promise<DayLevelRow[]> {
  return sequelize.query<DayLevelRow>(
    `WITH days AS (
       SELECT generate_series((now() AT TIME ZONE $tz::text)::date - 89, (now() AT TIME ZONE $tz::text)::date, interval '1 day')::date AS d
     )
     SELECT to_char(days.d, 'YYYY-MM-DD') AS day, COALESCE(SUM(x.on_hand_after_liters), 0) AS "onHand"
     FROM days CROSS JOIN tanks t
     LEFT JOIN LATERAL (
       SELECT m.on_hand_after_liters FROM tank_movements m
       WHERE m.coop_id = $coopId AND m.tank_id = t.id AND m.occurred_at < ((days.d + 1)::timestamp AT TIME ZONE $tz::text)
       ORDER BY m.occurred_at DESC, m.id DESC LIMIT 1
     ) x ON true
     WHERE t.coop_id = $coopId AND t.active
     GROUP BY days.d ORDER BY days.d`,
    { bind: { coopId, tz: timeZone }, type: QueryTypes.SELECT },
  );
}

/** One member among those owing most, with how many owe anything and their total (the same on every row). */
export interface OwingRow {
  membershipId: InferAttributes<Membership>['id'] | null;
  name: InferAttributes<User>['name'] | null;
  outstanding: InferAttributes<Invoice>['totalCents'] | null;
  members: string;
  total: string;
}

/**
 * The ten members owing most on issued invoices (largest first, then by membership), and how
 * many members owe anything and how much in all. Always at least one row: when nobody owes,
 * one row with null member fields and zero totals. A removed member's name is null.
 */
export function topOwing(coopId: number): Promise<OwingRow[]> {
  return sequelize.query<OwingRow>(
    `WITH owing AS (
       SELECT membership_id, SUM(${outstandingSql()}) AS outstanding FROM invoices
       WHERE coop_id = $coopId AND kind = 'invoice' AND ${openStatusSql()}
       GROUP BY membership_id HAVING SUM(${outstandingSql()}) > 0
     ), totals AS (SELECT COUNT(*) AS members, COALESCE(SUM(outstanding), 0) AS total FROM owing)
     SELECT o.membership_id AS "membershipId", u.name, o.outstanding, totals.members, totals.total
     FROM totals LEFT JOIN LATERAL (SELECT * FROM owing ORDER BY outstanding DESC, membership_id LIMIT 10) o ON true
     LEFT JOIN memberships m ON m.id = o.membership_id AND m.coop_id = $coopId LEFT JOIN users u ON u.id = m.user_id
     ORDER BY o.outstanding DESC NULLS LAST, o.membership_id`,
    { bind: { coopId }, type: QueryTypes.SELECT },
  );
}

/** What a batch's verdict is judged from (lib/brewing qualityOf). */
type VerdictColumns = Pick<InferAttributes<Batch>, 'qualityStandard' | 'labResults'>;

/** The overview's cards in one row: my figures always, each role section only when asked for (else null). */
export interface CardsRow {
  /** The active tanks (litres and cents as NUMERIC/BIGINT text; reserved net of lapsed reservations). */
  tanks: { onHand: string; reserved: string; held: string; capacity: string; value: string }[];
  /** The policy in force (lib/tank/pricing-policy policyInForce's row), NUMERIC columns as text. */
  policy: (PolicyRow & { id: number }) | null;
  reservations: { id: number; tankName: string; quantityLiters: string; windowEnd: string }[];
  outstandingCents: string;
  creditCents: string;
  unallocatedCents: string;
  working: ({ id: number; number: number; status: string; oilLiters: string; since: string } & VerdictColumns)[] | null;
  released: ({ id: number; number: number; releasedAt: string; releasedLiters: string } & VerdictColumns)[] | null;
  /** The chemical stock picture (lib/supplies), for brewers. */
  stock: StockPictureRow | null;
  invoiceSums: { kind: string; status: string; count: number; total: number; paid: number; owed: number }[] | null;
  unmatched: { count: number; cents: number } | null;
  invitations: { pending: number; notSent: number } | null;
  events: { at: string; who: string | null; action: string }[] | null;
}

/**
 * Every card figure of the overview in one round trip (it was a dozen parallel model reads, the
 * largest cost of the first screen): the active tanks' totals, the price policy in force, my open
 * reservations and my account (the same sums as lib/billing's memberBalance), and — only for the roles that see them — the batches under way, the
 * three latest released (with what their quality verdicts are judged from) and the chemical stock
 * picture (lib/supplies STOCK_PICTURE_COLUMNS, bound from `stock`),
 * the month's invoice sums by kind and status, unmatched payments, pending invitations and the
 * last eight audited changes. A section not asked for is an InitPlan never run and comes back null.
 */
export async function overviewCards(p: {
  coopId: number;
  membershipId: number;
  working: readonly string[];
  stock: StockPictureParams;
  period: string;
  brewer: boolean;
  treasurer: boolean;
  admin: boolean;
}): Promise<CardsRow> {
  const { working, stock, ...rest } = p;
  // The tank rows follow lib/tank's findTankRows (reserved net of open reservations whose window
  // has ended; what is available is then lib/tank's tankAvailableMl per tank) and the policy lib/tank/pricing-policy's
  // policyInForce (the newest row already in effect); tests/api/overview.test.ts checks both.
  // Each was a round trip of its own; as sub-selects they cost PostgreSQL a little planning.
  const [row] = await sequelize.query<CardsRow>(
    `SELECT
       (SELECT COALESCE(json_agg(json_build_object('onHand', on_hand_liters::text, 'reserved', reserved::text,
               'held', held_liters::text, 'capacity', capacity_liters::text, 'value', value_cents::text)), '[]')
          FROM (SELECT t.on_hand_liters, t.held_liters, t.capacity_liters, t.value_cents,
                       t.reserved_liters - ${lapsedLitersSql('t')} AS reserved
                FROM tanks t WHERE t.coop_id = $coopId AND t.active) x) AS tanks,
       (SELECT row_to_json(x) FROM (
          SELECT id, kind, price_cents_per_gallon::text, margin_cents_per_gallon::text, margin_pct::text,
                 surcharge_cents_per_gallon::text, road_tax_cents_per_gallon::text FROM price_policies
          WHERE coop_id = $coopId AND effective_from <= now() ORDER BY effective_from DESC, id DESC LIMIT 1) x) AS policy,
       (SELECT COALESCE(json_agg(x ORDER BY x."windowEnd"), '[]') FROM (
          SELECT r.id, t.name AS "tankName", r.quantity_liters::text AS "quantityLiters", r.window_end AS "windowEnd"
          FROM reservations r JOIN tanks t ON t.id = r.tank_id AND t.coop_id = $coopId
          WHERE r.coop_id = $coopId AND r.membership_id = $membershipId AND r.status = 'open' AND r.window_end >= now()
          ORDER BY r.window_end LIMIT 10) x) AS reservations,
       (SELECT COALESCE(SUM(${outstandingSql()}), 0) FROM invoices
          WHERE coop_id = $coopId AND membership_id = $membershipId AND kind = 'invoice' AND ${openStatusSql()}) AS "outstandingCents",
       (SELECT COALESCE(SUM(amount_cents), 0) FROM member_credits WHERE coop_id = $coopId AND membership_id = $membershipId) AS "creditCents",
       (SELECT COALESCE(SUM(unallocated_cents), 0) FROM payments WHERE coop_id = $coopId AND membership_id = $membershipId) AS "unallocatedCents",
       CASE WHEN $brewer THEN (SELECT COALESCE(json_agg(x ORDER BY x.number), '[]') FROM (
          SELECT id, number, status, oil_liters::text AS "oilLiters", status_changed_at AS since,
                 quality_standard AS "qualityStandard", lab_results AS "labResults" FROM batches
          WHERE coop_id = $coopId AND status = ANY($working) ORDER BY number LIMIT 10) x) END AS working,
       CASE WHEN $brewer THEN (SELECT COALESCE(json_agg(x ORDER BY x.number DESC), '[]') FROM (
          SELECT id, number, released_at AS "releasedAt", released_liters::text AS "releasedLiters",
                 quality_standard AS "qualityStandard", lab_results AS "labResults" FROM batches
          WHERE coop_id = $coopId AND status = 'released' ORDER BY number DESC LIMIT 3) x) END AS released,
       CASE WHEN $brewer THEN (SELECT row_to_json(s) FROM (SELECT ${STOCK_PICTURE_COLUMNS}) s) END AS stock,
       CASE WHEN $treasurer THEN (SELECT COALESCE(json_agg(x), '[]') FROM (
          SELECT kind, status, COUNT(*) AS count, SUM(total_cents) AS total, SUM(paid_cents) AS paid,
                 SUM(${outstandingSql()}) AS owed
          FROM invoices WHERE coop_id = $coopId AND period = $period::date GROUP BY kind, status) x) END AS "invoiceSums",
       CASE WHEN $treasurer THEN (SELECT json_build_object('count', COUNT(*), 'cents', COALESCE(SUM(unallocated_cents), 0))
          FROM payments WHERE coop_id = $coopId AND unallocated_cents > 0) END AS unmatched,
       CASE WHEN $admin THEN (SELECT json_build_object('pending', COUNT(*), 'notSent', COUNT(*) FILTER (WHERE delivery = 'not-sent'))
          FROM invitations WHERE coop_id = $coopId AND status = 'pending' AND expires_at > now()) END AS invitations,
       CASE WHEN $admin THEN (SELECT COALESCE(json_agg(x ORDER BY x.at DESC, x.id DESC), '[]') FROM (
          SELECT a.id, a.created_at AS at, u.name AS who, a.action FROM audit_events a LEFT JOIN users u ON u.id = a.actor_user_id
          WHERE a.coop_id = $coopId ORDER BY a.created_at DESC, a.id DESC LIMIT 8) x) END AS events`,
    { bind: { ...stock, ...rest, working: [...working] }, type: QueryTypes.SELECT },
  );
  return row!; // a SELECT without FROM always yields one row
}
