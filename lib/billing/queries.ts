import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';
import type { Draw, Payment } from '@/models';
import { cents } from './cents';
import { openStatusSql, outstandingSql } from './status';

// Billing's bound statements (the named exception to "models first"): the co-op's billing lock
// and month instants, and the period totals and id taking used by payments and reconciliation.
// The month run's set-based statements are in ./run/queries.

/** Advisory-lock namespace for a co-op's money writes (any constant that no other module uses). */
const BILLING_LOCK_NAMESPACE = 73_051;

/**
 * Takes the co-op's billing advisory lock until the transaction ends (`pg_advisory_xact_lock`):
 * a model call cannot say it.
 */
export async function advisoryLockCoopBilling(t: Transaction, coopId: number): Promise<void> {
  await sequelize.query('SELECT pg_advisory_xact_lock($1::int, $2::int)', {
    bind: [BILLING_LOCK_NAMESPACE, coopId],
    type: QueryTypes.SELECT,
    transaction: t,
  });
}

/**
 * The first instant of a month and of the next one in a time zone, as PostgreSQL's time-zone
 * rules compute them (the same rules the closed-month triggers use).
 * @param periodDate 'YYYY-MM-01'
 */
export async function monthInstants(
  periodDate: string,
  timeZone: string,
  t?: Transaction,
): Promise<{ start: Date; end: Date }> {
  const row = await sequelize.query<{ start: Date; end: Date }>(
    `SELECT ($1::date)::timestamp AT TIME ZONE $2 AS start, (($1::date + interval '1 month')::timestamp) AT TIME ZONE $2 AS "end"`,
    { bind: [periodDate, timeZone], type: QueryTypes.SELECT, plain: true, transaction: t },
  );
  return { start: new Date(row!.start), end: new Date(row!.end) };
}

/**
 * The statements of the payments side of billing that a model query cannot say: taking a row id
 * before its row exists, and the month's reconciliation totals (aggregates with FILTER, and an
 * anti-join). Each one is bound ($1, $2 …), never built from values. Counts and sums arrive as
 * BIGINT strings; they are parsed here, once, into numbers (cents stay well inside 2^53).
 */

/** Tables whose ids are taken before the row is written, so that a key can name its row. */
type KeyedTable = 'payment_attempts' | 'refunds';

/**
 * Takes the next id of a table's own sequence, so the row's idempotency key can contain the id it
 * will be written with (`payment-attempt-<id>-<salt>`) and both go in with one INSERT.
 */
export async function takeNextId(table: KeyedTable, t: Transaction): Promise<number> {
  const [row] = await sequelize.query<{ id: string }>("SELECT nextval(pg_get_serial_sequence($1, 'id')) AS id", {
    bind: [table],
    type: QueryTypes.SELECT,
    transaction: t,
  });
  return Number(row!.id);
}

/** A month's invoices and credit notes, counted and summed (cents). */
export interface PeriodInvoiceTotals {
  /** Invoices issued (neither draft nor void). */
  issued: number;
  drafts: number;
  invoicedCents: number;
  /** Invoiced, counting a negative invoice (more credit than charges) as zero. */
  invoicedPositiveCents: number;
  creditNotesCents: number;
  paidCents: number;
  /** Still owed on issued and partly paid invoices. */
  outstandingCents: number;
  /** Issued and partly paid invoices. */
  unpaid: number;
}

/** Counts and sums a month's invoices in one pass over its rows. */
export async function periodInvoiceTotals(
  coopId: number,
  periodDate: string,
  t?: Transaction,
): Promise<PeriodInvoiceTotals> {
  const [r] = await sequelize.query<Record<keyof PeriodInvoiceTotals, string>>(
    `SELECT
       count(*) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS "issued",
       count(*) FILTER (WHERE status = 'draft') AS "drafts",
       SUM(total_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS "invoicedCents",
       SUM(GREATEST(total_cents, 0)) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS "invoicedPositiveCents",
       SUM(total_cents) FILTER (WHERE kind = 'credit-note') AS "creditNotesCents",
       SUM(paid_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS "paidCents",
       SUM(${outstandingSql()}) FILTER (WHERE kind = 'invoice' AND ${openStatusSql()}) AS "outstandingCents",
       count(*) FILTER (WHERE kind = 'invoice' AND ${openStatusSql()}) AS "unpaid"
     FROM invoices WHERE coop_id = $1 AND period = $2::date`,
    { bind: [coopId, periodDate], type: QueryTypes.SELECT, transaction: t },
  );
  return {
    issued: cents(r?.issued),
    drafts: cents(r?.drafts),
    invoicedCents: cents(r?.invoicedCents),
    invoicedPositiveCents: cents(r?.invoicedPositiveCents),
    creditNotesCents: cents(r?.creditNotesCents),
    paidCents: cents(r?.paidCents),
    outstandingCents: cents(r?.outstandingCents),
    unpaid: cents(r?.unpaid),
  };
}

type PaymentCents = Pick<
  Payment,
  'amountCents' | 'appliedCents' | 'creditedCents' | 'unallocatedCents' | 'refundedCents'
>;

/** Money received in a month and where it went (cents). */
export interface PeriodPaymentTotals {
  receivedCents: number;
  byMethod: Record<Payment['method'], number>;
  appliedCents: number;
  creditedCents: number;
  unallocatedCents: number;
  refundedCents: number;
  /** Received this month but applied to invoices of other months. */
  appliedElsewhereCents: number;
}

/** Sums the payments received in a month, by method and by where the money went. */
export async function periodPaymentTotals(
  coopId: number,
  periodDate: string,
  t?: Transaction,
): Promise<PeriodPaymentTotals> {
  const [r] = await sequelize.query<Record<keyof PaymentCents | 'card' | 'cash' | 'cheque' | 'elsewhere', string>>(
    `SELECT SUM(p.amount_cents) AS "amountCents",
       SUM(p.amount_cents) FILTER (WHERE p.method = 'card') AS "card",
       SUM(p.amount_cents) FILTER (WHERE p.method = 'cash') AS "cash",
       SUM(p.amount_cents) FILTER (WHERE p.method = 'cheque') AS "cheque",
       SUM(p.applied_cents) AS "appliedCents", SUM(p.credited_cents) AS "creditedCents",
       SUM(p.unallocated_cents) AS "unallocatedCents", SUM(p.refunded_cents) AS "refundedCents",
       SUM(p.applied_cents) FILTER (WHERE i.period <> p.period) AS "elsewhere"
     FROM payments p LEFT JOIN invoices i ON i.id = p.invoice_id
     WHERE p.coop_id = $1 AND p.period = $2::date`,
    { bind: [coopId, periodDate], type: QueryTypes.SELECT, transaction: t },
  );
  return {
    receivedCents: cents(r?.amountCents),
    byMethod: { card: cents(r?.card), cash: cents(r?.cash), cheque: cents(r?.cheque) },
    appliedCents: cents(r?.appliedCents),
    creditedCents: cents(r?.creditedCents),
    unallocatedCents: cents(r?.unallocatedCents),
    refundedCents: cents(r?.refundedCents),
    appliedElsewhereCents: cents(r?.elsewhere),
  };
}

/**
 * Draws that happened between two instants and are on no issued invoice (no unreleased line of a
 * non-draft invoice names them): how many, and their total (cents).
 */
export async function unbilledDrawTotals(
  coopId: number,
  start: Date,
  end: Date,
  t?: Transaction,
): Promise<{ count: number; totalCents: number }> {
  const [r] = await sequelize.query<{ count: string; totalCents: Draw['totalCents'] | null }>(
    `SELECT count(*) AS "count", SUM(d.total_cents) AS "totalCents" FROM draws d
     WHERE d.coop_id = $1 AND d.occurred_at >= $2::timestamptz AND d.occurred_at < $3::timestamptz
       AND NOT EXISTS (SELECT 1 FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id
                       WHERE l.draw_id = d.id AND NOT l.released AND i.status <> 'draft')`,
    { bind: [coopId, start, end], type: QueryTypes.SELECT, transaction: t },
  );
  return { count: cents(r?.count), totalCents: cents(r?.totalCents) };
}
