import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';
import type { Invoice, Membership } from '@/models';

/**
 * The month run's set-based statements: each works on a whole chunk of members (or drafts) at
 * once with INSERT … SELECT / UPDATE … FROM, so a 10,000-member month stays a few dozen
 * statements per 500 members instead of hundreds of thousands of row-by-row writes. Everything
 * else in billing goes through the models. Every statement runs inside the caller's transaction
 * (which holds the co-op's billing lock) and is scoped by co-op.
 */

/** Who and what a run bills. */
export interface RunScope {
  coopId: number;
  /** 'YYYY-MM-01' */
  period: string;
  /** The first instant of the next month in the co-op's time zone. */
  end: Date;
  /** Monthly dues in cents; 0 when the co-op charges none. */
  duesCents: number;
  /** Limits the run to these memberships, or null for everyone. */
  only: number[] | null;
}

/**
 * Who gets an invoice for the month: active members owing dues, and anyone with unbilled draws
 * up to the month's end (late-recorded ones included) or unbilled adjustments, skipping members
 * whose invoice for the month is already issued.
 */
const MEMBERS_TO_BILL = `
  FROM memberships m
  WHERE m.coop_id = $coopId
    AND ($only::int[] IS NULL OR m.id = ANY($only::int[]))
    AND NOT EXISTS (SELECT 1 FROM invoices i WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date
                    AND i.kind = 'invoice' AND i.status NOT IN ('draft', 'void'))
    AND (
      ($dues::bigint > 0 AND m.status = 'active' AND m.joined_at < $end::timestamptz)
      OR EXISTS (SELECT 1 FROM invoices i WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date
                 AND i.kind = 'invoice' AND i.status = 'draft')
      OR EXISTS (SELECT 1 FROM draws d WHERE d.coop_id = $coopId AND d.membership_id = m.id AND d.occurred_at < $end::timestamptz
                 AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.draw_id = d.id AND NOT l.released))
      OR EXISTS (SELECT 1 FROM billing_adjustments a WHERE a.coop_id = $coopId AND a.membership_id = m.id AND a.period <= $period::date
                 AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.adjustment_id = a.id AND NOT l.released))
    )`;

const scopeBind = (s: RunScope) => ({
  coopId: s.coopId,
  period: s.period,
  end: s.end,
  dues: s.duesCents,
  only: s.only,
});

/** How many members the run will bill (shown as the run's total while it works). */
export async function countMembersToBill(s: RunScope, t: Transaction): Promise<number> {
  const row = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${MEMBERS_TO_BILL}`, {
    bind: scopeBind(s),
    type: QueryTypes.SELECT,
    plain: true,
    transaction: t,
  });
  return row?.n ?? 0;
}

/** The next chunk of members to bill after membership id `afterId` (keyset paging by id). */
export async function nextMembersToBill(
  s: RunScope,
  afterId: number,
  limit: number,
  t: Transaction,
): Promise<Membership['id'][]> {
  const rows = await sequelize.query<{ id: number }>(
    `SELECT m.id ${MEMBERS_TO_BILL} AND m.id > $after ORDER BY m.id LIMIT $limit`,
    {
      bind: { ...scopeBind(s), after: afterId, limit },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  return rows.map((r) => r.id);
}

/** Deletes the month's drafts of these members (their lines go with them: ON DELETE CASCADE). */
export async function deleteDraftsOf(t: Transaction, s: RunScope, membershipIds: number[]): Promise<void> {
  await sequelize.query(
    `DELETE FROM invoices i USING unnest($ids::int[]) AS m(id)
     WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date AND i.kind = 'invoice' AND i.status = 'draft'`,
    { bind: { coopId: s.coopId, period: s.period, ids: membershipIds }, type: QueryTypes.BULKDELETE, transaction: t },
  );
}

/**
 * Creates an empty draft for each of these members who has no live invoice for the month.
 * @returns the new drafts' ids
 */
export async function createEmptyDrafts(
  t: Transaction,
  s: RunScope,
  runId: number,
  membershipIds: number[],
): Promise<Invoice['id'][]> {
  const rows = await sequelize.query<{ id: number }>(
    `INSERT INTO invoices (coop_id, membership_id, period, billing_run_id, created_at, updated_at)
     SELECT $coopId, m.id, $period::date, $runId, now(), now() FROM unnest($ids::int[]) AS m(id)
     WHERE NOT EXISTS (SELECT 1 FROM invoices i WHERE i.coop_id = $coopId AND i.membership_id = m.id AND i.period = $period::date
                       AND i.kind = 'invoice' AND i.status <> 'void')
     RETURNING id`,
    {
      bind: { coopId: s.coopId, period: s.period, runId, ids: membershipIds },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  return rows.map((r) => r.id);
}

/** Every statement below finds its drafts by primary key (and co-op). */
const IN_DRAFTS = 'i.id = ANY($inv::int[]) AND i.coop_id = $coopId';

/**
 * A line per draw up to the month's end that is not on a live invoice yet, at its locked fuel
 * amount (reversals negative, described by the date of the draw they reverse).
 */
export async function insertDrawLines(t: Transaction, s: RunScope, invoiceIds: number[]): Promise<void> {
  await sequelize.query(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, occurred_at, quantity_liters, unit_price_cents_per_gallon, amount_cents, draw_id)
     SELECT $coopId, i.id, 1000 + row_number() OVER (PARTITION BY i.id ORDER BY d.occurred_at, d.id),
       CASE WHEN d.reverses_draw_id IS NULL THEN 'draw' ELSE 'draw-reversal' END,
       CASE WHEN d.reverses_draw_id IS NULL THEN 'Fuel drawn, ' || d.declared_use || ' use'
            ELSE 'Correction: reverses the draw of ' || to_char(o.occurred_at AT TIME ZONE c.timezone, 'Mon DD, YYYY') END,
       d.occurred_at, d.quantity_liters, d.unit_price_cents_per_gallon, d.fuel_cents, d.id
     FROM invoices i
     JOIN coops c ON c.id = i.coop_id
     JOIN draws d ON d.coop_id = $coopId AND d.membership_id = i.membership_id AND d.occurred_at < $end::timestamptz
     LEFT JOIN draws o ON o.id = d.reverses_draw_id
     WHERE ${IN_DRAFTS} AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.draw_id = d.id AND NOT l.released)`,
    { bind: { coopId: s.coopId, inv: invoiceIds, end: s.end }, type: QueryTypes.INSERT, transaction: t },
  );
}

/**
 * One surcharge line and one road-fuel-tax line per draft: the sums of its draws' locked amounts
 * (never recomputed); a rate is shown only when every draw had the same one.
 */
export async function insertSurchargeAndTaxLines(t: Transaction, coopId: number, invoiceIds: number[]): Promise<void> {
  await sequelize.query(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, quantity_liters, unit_price_cents_per_gallon, amount_cents)
     SELECT $coopId, x.invoice_id, x.sort_key, x.kind, x.description, x.q, x.rate, x.amount FROM (
       SELECT l.invoice_id, 900010 AS sort_key, 'surcharge' AS kind, 'Co-op surcharge on fuel drawn' AS description,
              SUM(l.quantity_liters) FILTER (WHERE d.surcharge_cents <> 0) AS q,
              CASE WHEN MIN(d.surcharge_cents_per_gallon) FILTER (WHERE d.surcharge_cents <> 0) = MAX(d.surcharge_cents_per_gallon) FILTER (WHERE d.surcharge_cents <> 0)
                   THEN MIN(d.surcharge_cents_per_gallon) FILTER (WHERE d.surcharge_cents <> 0) END AS rate,
              SUM(d.surcharge_cents) AS amount
       FROM invoice_lines l JOIN draws d ON d.id = l.draw_id JOIN invoices i ON i.id = l.invoice_id
       WHERE ${IN_DRAFTS} GROUP BY l.invoice_id
       UNION ALL
       SELECT l.invoice_id, 900020, 'road-tax', 'Road-fuel tax on fuel declared for road use',
              SUM(l.quantity_liters) FILTER (WHERE d.tax_cents <> 0),
              CASE WHEN MIN(d.road_tax_cents_per_gallon) FILTER (WHERE d.tax_cents <> 0) = MAX(d.road_tax_cents_per_gallon) FILTER (WHERE d.tax_cents <> 0)
                   THEN MIN(d.road_tax_cents_per_gallon) FILTER (WHERE d.tax_cents <> 0) END,
              SUM(d.tax_cents)
       FROM invoice_lines l JOIN draws d ON d.id = l.draw_id JOIN invoices i ON i.id = l.invoice_id
       WHERE ${IN_DRAFTS} GROUP BY l.invoice_id
     ) x WHERE x.amount <> 0`,
    { bind: { coopId, inv: invoiceIds }, type: QueryTypes.INSERT, transaction: t },
  );
}

/** A dues line on each draft whose member was active and had joined before the month's end. */
export async function insertDuesLines(t: Transaction, s: RunScope, invoiceIds: number[]): Promise<void> {
  await sequelize.query(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, amount_cents)
     SELECT $coopId, i.id, 900000, 'dues', 'Membership dues for ' || to_char($period::date, 'FMMonth YYYY'), $dues::bigint
     FROM invoices i JOIN memberships m ON m.id = i.membership_id
     WHERE ${IN_DRAFTS} AND m.status = 'active' AND m.joined_at < $end::timestamptz`,
    {
      bind: { coopId: s.coopId, inv: invoiceIds, period: s.period, dues: s.duesCents, end: s.end },
      type: QueryTypes.INSERT,
      transaction: t,
    },
  );
}

/** A line per adjustment of this month or earlier that is not on a live invoice yet. */
export async function insertAdjustmentLines(t: Transaction, s: RunScope, invoiceIds: number[]): Promise<void> {
  await sequelize.query(
    `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, occurred_at, amount_cents, adjustment_id)
     SELECT $coopId, i.id, 910000 + row_number() OVER (PARTITION BY i.id ORDER BY a.id), 'adjustment', a.description, a.created_at, a.amount_cents, a.id
     FROM invoices i JOIN billing_adjustments a ON a.coop_id = $coopId AND a.membership_id = i.membership_id AND a.period <= $period::date
     WHERE ${IN_DRAFTS} AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.adjustment_id = a.id AND NOT l.released)`,
    { bind: { coopId: s.coopId, inv: invoiceIds, period: s.period }, type: QueryTypes.INSERT, transaction: t },
  );
}

/**
 * The credit line of each of these drafts: the member's credit balance (member_credits) applied
 * up to the draft's subtotal. The drafts must have no credit line yet.
 */
export async function insertCreditLines(t: Transaction, coopId: number, invoiceIds: number[]): Promise<void> {
  await sequelize.query(
    `WITH sub AS (
       SELECT i.id, i.membership_id, SUM(l.amount_cents) AS s
       FROM invoices i JOIN invoice_lines l ON l.invoice_id = i.id AND l.kind <> 'credit'
       WHERE ${IN_DRAFTS}
       GROUP BY i.id, i.membership_id
     ), bal AS (
       SELECT mc.membership_id, SUM(mc.amount_cents) AS b FROM member_credits mc
       WHERE mc.coop_id = $coopId AND mc.membership_id IN (SELECT membership_id FROM sub) GROUP BY mc.membership_id
     )
     INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, amount_cents)
     SELECT $coopId, sub.id, 990000, 'credit', 'Credit on your account applied', -LEAST(bal.b, sub.s)
     FROM sub JOIN bal ON bal.membership_id = sub.membership_id
     WHERE bal.b > 0 AND sub.s > 0`,
    { bind: { coopId, inv: invoiceIds }, type: QueryTypes.INSERT, transaction: t },
  );
}

/**
 * Deletes those of these drafts that ended up with no line (e.g. the member's draws went onto
 * another month's draft).
 * @returns how many were deleted
 */
export async function deleteEmptyDrafts(t: Transaction, coopId: number, invoiceIds: number[]): Promise<number> {
  return sequelize.query(
    `DELETE FROM invoices i WHERE ${IN_DRAFTS} AND NOT EXISTS (SELECT 1 FROM invoice_lines l WHERE l.invoice_id = i.id)`,
    {
      bind: { coopId, inv: invoiceIds },
      type: QueryTypes.BULKDELETE,
      transaction: t,
    },
  );
}

/** Sets each of these drafts' total to the exact sum of its lines. */
export async function refreshDraftTotals(t: Transaction, coopId: number, invoiceIds: number[]): Promise<void> {
  await sequelize.query(
    `UPDATE invoices i SET total_cents = s.total, updated_at = now()
     FROM (SELECT l.invoice_id, SUM(l.amount_cents) AS total FROM invoice_lines l
           WHERE l.invoice_id = ANY($inv::int[]) AND l.coop_id = $coopId GROUP BY l.invoice_id) s
     WHERE i.id = s.invoice_id AND i.coop_id = $coopId AND i.total_cents IS DISTINCT FROM s.total`,
    { bind: { coopId, inv: invoiceIds }, type: QueryTypes.BULKUPDATE, transaction: t },
  );
}

/**
 * Issues these drafts: numbers `afterNumber + 1 …` in order of member name (then id), the issue
 * time, the due date, e-mail queued, and 'paid' for a draft that owes nothing.
 * @returns how many were issued
 */
export async function numberAndIssueDrafts(
  t: Transaction,
  coopId: number,
  invoiceIds: number[],
  afterNumber: number,
  dueOn: string,
): Promise<number> {
  return sequelize.query(
    `WITH numbered AS (
       SELECT i.id, row_number() OVER (ORDER BY lower(u.name), i.id) AS rn
       FROM invoices i JOIN memberships m ON m.id = i.membership_id JOIN users u ON u.id = m.user_id
       WHERE ${IN_DRAFTS} AND i.status = 'draft')
     UPDATE invoices i SET number = $last + n.rn, issued_at = now(), due_on = $dueOn::date, email_status = 'queued', updated_at = now(),
       status = CASE WHEN i.total_cents <= 0 THEN 'paid' ELSE 'issued' END
     FROM numbered n WHERE i.id = n.id`,
    { bind: { coopId, inv: invoiceIds, last: afterNumber, dueOn }, type: QueryTypes.BULKUPDATE, transaction: t },
  );
}
