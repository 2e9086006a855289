import 'server-only';
import { exec, int, select, type Bind } from './db';
import type { Transaction } from 'sequelize';
import { invoiceLabel, periodToDate } from './periods';
import type { PageOf, PaymentDTO, RefundDTO } from './types';

interface PaymentRow {
  id: number; method: PaymentDTO['method']; membership_id: number; member_name: string; invoice_id: number | null; inv_number: number | null;
  inv_kind: 'invoice' | 'credit-note' | null; inv_period: string | null; amount_cents: string; applied_cents: string; credited_cents: string;
  unallocated_cents: string; refunded_cents: string; received_on: string; period: string; reference: string | null; note: string | null;
  period_closed: boolean; member_credit: string;
}

const PAYMENT_SELECT = `
  SELECT p.id, p.method, p.membership_id, u.name AS member_name, p.invoice_id, i.number AS inv_number, i.kind AS inv_kind,
         to_char(i.period, 'YYYY-MM') AS inv_period, p.amount_cents, p.applied_cents, p.credited_cents, p.unallocated_cents, p.refunded_cents,
         to_char(p.received_on, 'YYYY-MM-DD') AS received_on, to_char(p.period, 'YYYY-MM') AS period, p.reference, p.note,
         EXISTS (SELECT 1 FROM billing_periods bp WHERE bp.coop_id = p.coop_id AND bp.period = p.period AND bp.status = 'closed') AS period_closed,
         (SELECT COALESCE(SUM(mc.amount_cents), 0) FROM member_credits mc WHERE mc.coop_id = p.coop_id AND mc.membership_id = p.membership_id) AS member_credit
  FROM payments p
  JOIN memberships m ON m.id = p.membership_id
  JOIN users u ON u.id = m.user_id
  LEFT JOIN invoices i ON i.id = p.invoice_id`;

/**
 * How much of a payment may still be refunded: its unmatched part, plus the part it put into the
 * member's credit as long as that credit has not been spent. Money applied to an invoice is not
 * refunded directly — void the invoice first (its payments become credit) or add an adjustment.
 */
export function refundableCents(p: { unallocated: number; credited: number; memberCredit: number }): number {
  return p.unallocated + Math.max(0, Math.min(p.credited, p.memberCredit));
}

async function withRefunds(coopId: number, rows: PaymentRow[]): Promise<PaymentDTO[]> {
  const ids = rows.map((r) => r.id);
  const refunds = ids.length
    ? await select<{ id: number; payment_id: number; amount_cents: string; status: RefundDTO['status']; reason: string; refunded_on: string; failure_message: string | null }>(
        `SELECT id, payment_id, amount_cents, status, reason, to_char(refunded_on, 'YYYY-MM-DD') AS refunded_on, failure_message
         FROM refunds WHERE coop_id = $coopId AND payment_id = ANY($ids::int[]) ORDER BY id`,
        { coopId, ids },
      )
    : [];
  return rows.map((r) => ({
    id: r.id,
    method: r.method,
    memberId: r.membership_id,
    memberName: r.member_name,
    invoiceId: r.invoice_id,
    invoiceLabel: r.inv_kind ? invoiceLabel(r.inv_kind, r.inv_number) : null,
    invoicePeriod: r.inv_period,
    amountCents: int(r.amount_cents),
    appliedCents: int(r.applied_cents),
    creditedCents: int(r.credited_cents),
    unallocatedCents: int(r.unallocated_cents),
    refundedCents: int(r.refunded_cents),
    refundableCents: refundableCents({ unallocated: int(r.unallocated_cents), credited: int(r.credited_cents), memberCredit: int(r.member_credit) }),
    receivedOn: r.received_on,
    period: r.period,
    reference: r.reference,
    note: r.note,
    periodClosed: r.period_closed,
    refunds: refunds
      .filter((f) => f.payment_id === r.id)
      .map((f) => ({ id: f.id, amountCents: int(f.amount_cents), status: f.status, reason: f.reason, refundedOn: f.refunded_on, failureMessage: f.failure_message })),
  }));
}

/** Payments of the co-op matching an extra condition on `p` (bound parameters in `bind`). */
export async function listPaymentsWhere(coopId: number, where: string, bind: Bind, t?: Transaction): Promise<PaymentDTO[]> {
  const rows = await select<PaymentRow>(`${PAYMENT_SELECT} WHERE p.coop_id = $coopId AND (${where}) ORDER BY p.received_on DESC, p.id DESC`, { ...bind, coopId }, t);
  return withRefunds(coopId, rows);
}

/** One payment of the co-op (null when it is not theirs). */
export async function findPayment(coopId: number, id: number, t?: Transaction): Promise<PaymentDTO | null> {
  const [p] = await listPaymentsWhere(coopId, 'p.id = $id', { id }, t);
  return p ?? null;
}

/** Payments received in a month (or all), optionally only unmatched ones, paged. */
export async function listPayments(coopId: number, f: { period?: string; unmatched?: boolean; page: number; pageSize: number }): Promise<PageOf<PaymentDTO>> {
  const where = ['p.coop_id = $coopId'];
  const bind: Bind = { coopId, limit: f.pageSize, offset: (f.page - 1) * f.pageSize };
  if (f.period) {
    where.push('p.period = $period::date');
    bind.period = periodToDate(f.period);
  }
  if (f.unmatched) where.push('p.unallocated_cents > 0');
  const w = where.join(' AND ');
  const rows = await select<PaymentRow>(`${PAYMENT_SELECT} WHERE ${w} ORDER BY p.received_on DESC, p.id DESC LIMIT $limit OFFSET $offset`, bind);
  const [n] = await select<{ n: number }>(`SELECT count(*)::int AS n FROM payments p WHERE ${w}`, bind);
  return { rows: await withRefunds(coopId, rows), total: n?.n ?? 0, page: f.page, pageSize: f.pageSize };
}

/**
 * Recomputes an invoice's paid amount and status from the payments applied to it (monotonic and
 * idempotent: the same payments always give the same result). Void invoices are left alone.
 */
export async function refreshInvoicePaid(t: Transaction, coopId: number, invoiceId: number): Promise<void> {
  await exec(
    `UPDATE invoices i SET paid_cents = s.paid, updated_at = now(),
       status = CASE WHEN s.paid >= i.total_cents THEN 'paid' WHEN s.paid > 0 THEN 'partly-paid' ELSE 'issued' END
     FROM (SELECT COALESCE(SUM(applied_cents), 0) AS paid FROM payments WHERE invoice_id = $id AND coop_id = $coopId) s
     WHERE i.id = $id AND i.coop_id = $coopId AND i.kind = 'invoice' AND i.status IN ('issued','partly-paid','paid')
       AND (i.paid_cents <> s.paid OR i.status <> CASE WHEN s.paid >= i.total_cents THEN 'paid' WHEN s.paid > 0 THEN 'partly-paid' ELSE 'issued' END)`,
    { id: invoiceId, coopId },
    t,
  );
}
