import 'server-only';
import type { Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { conflict } from '@/lib/http';
import { sequelize } from '@/models';
import { exec, int, select } from './db';
import { INVOICE_SELECT, toSummary, type InvoiceRow } from './invoices';
import { lockCoopBilling, periodBounds } from './locks';
import { listPaymentsWhere } from './payments-read';
import { currentPeriod, periodLabel, periodToDate } from './periods';
import type { InvoiceSummary, PaymentDTO } from './types';

export interface ReconciliationCheck {
  label: string;
  leftCents: number;
  rightCents: number;
  ok: boolean;
}

export interface Reconciliation {
  period: string;
  closed: boolean;
  closedAt: string | null;
  closedBy: string | null;
  monthOver: boolean;
  invoices: {
    rows: InvoiceSummary[];
    issuedCount: number;
    draftCount: number;
    invoicedCents: number;
    creditNotesCents: number;
    paidCents: number;
    outstandingCents: number;
    unpaidCount: number;
  };
  payments: {
    receivedCents: number;
    byMethod: { card: number; cash: number; cheque: number };
    appliedCents: number;
    creditedCents: number;
    unallocatedCents: number;
    refundedCents: number;
    /** Received this month but applied to invoices of other months (normal: last month's invoices are paid this month). */
    appliedElsewhereCents: number;
    unmatched: PaymentDTO[];
  };
  pendingCardAttempts: number;
  pendingRefunds: number;
  unbilledDraws: { count: number; totalCents: number };
  checks: ReconciliationCheck[];
  /** Why the month cannot be closed yet (empty when it can). */
  blockers: string[];
}

/**
 * The month's books side by side: invoices with what is due, paid and outstanding; money
 * received that month and where it went; what is unmatched or still in flight; and identity
 * checks that must hold (each shows both sides so a difference is visible).
 */
export async function getReconciliation(coopId: number, period: string, t?: Transaction): Promise<Reconciliation> {
  const periodDate = periodToDate(period);
  const b = { coopId, period: periodDate };
  const rows = (await select<InvoiceRow>(`${INVOICE_SELECT} WHERE i.coop_id = $coopId AND i.period = $period::date AND i.status <> 'draft' ORDER BY i.number`, b, t)).map(toSummary);
  const [inv] = await select<Record<string, string>>(
    `SELECT
       count(*) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')) AS issued,
       count(*) FILTER (WHERE status = 'draft') AS drafts,
       COALESCE(SUM(total_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS invoiced,
       COALESCE(SUM(GREATEST(total_cents, 0)) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS invoiced_positive,
       COALESCE(SUM(total_cents) FILTER (WHERE kind = 'credit-note'), 0) AS credit_notes,
       COALESCE(SUM(paid_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS paid,
       COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)) FILTER (WHERE kind = 'invoice' AND status IN ('issued','partly-paid')), 0) AS outstanding,
       count(*) FILTER (WHERE kind = 'invoice' AND status IN ('issued','partly-paid')) AS unpaid
     FROM invoices WHERE coop_id = $coopId AND period = $period::date`,
    b,
    t,
  );
  const [lines] = await select<{ s: string }>(
    `SELECT COALESCE(SUM(l.amount_cents), 0) AS s FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id
     WHERE i.coop_id = $coopId AND i.period = $period::date AND i.kind = 'invoice' AND i.status NOT IN ('draft','void')`,
    b,
    t,
  );
  const [pay] = await select<Record<string, string>>(
    `SELECT COALESCE(SUM(amount_cents), 0) AS received,
       COALESCE(SUM(amount_cents) FILTER (WHERE method = 'card'), 0) AS card,
       COALESCE(SUM(amount_cents) FILTER (WHERE method = 'cash'), 0) AS cash,
       COALESCE(SUM(amount_cents) FILTER (WHERE method = 'cheque'), 0) AS cheque,
       COALESCE(SUM(applied_cents), 0) AS applied, COALESCE(SUM(credited_cents), 0) AS credited,
       COALESCE(SUM(unallocated_cents), 0) AS unallocated, COALESCE(SUM(refunded_cents), 0) AS refunded,
       COALESCE(SUM(p.applied_cents) FILTER (WHERE i.period <> p.period), 0) AS elsewhere
     FROM payments p LEFT JOIN invoices i ON i.id = p.invoice_id WHERE p.coop_id = $coopId AND p.period = $period::date`,
    b,
    t,
  );
  const [appliedToMonth] = await select<{ s: string }>(
    `SELECT COALESCE(SUM(p.applied_cents), 0) AS s FROM payments p JOIN invoices i ON i.id = p.invoice_id
     WHERE p.coop_id = $coopId AND i.period = $period::date AND i.status <> 'void'`,
    b,
    t,
  );
  const unmatched = await listPaymentsWhere(coopId, 'p.period = $period::date AND p.unallocated_cents > 0', { period: periodDate }, t);
  const [pending] = await select<{ attempts: number; refunds: number }>(
    `SELECT (SELECT count(*)::int FROM payment_attempts a JOIN invoices i ON i.id = a.invoice_id WHERE a.coop_id = $coopId AND a.status = 'pending' AND i.period = $period::date) AS attempts,
            (SELECT count(*)::int FROM refunds r JOIN payments p ON p.id = r.payment_id WHERE r.coop_id = $coopId AND r.status = 'pending' AND (p.period = $period::date OR date_trunc('month', r.refunded_on)::date = $period::date)) AS refunds`,
    b,
    t,
  );
  const [coop] = await select<{ timezone: string }>('SELECT timezone FROM coops WHERE id = $coopId', { coopId }, t);
  const { start, end } = await periodBounds(periodDate, coop!.timezone, t);
  const [unbilled] = await select<{ n: number; s: string }>(
    `SELECT count(*)::int AS n, COALESCE(SUM(total_cents), 0) AS s FROM draws d
     WHERE d.coop_id = $coopId AND d.occurred_at >= $start::timestamptz AND d.occurred_at < $end::timestamptz
       AND NOT EXISTS (SELECT 1 FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id WHERE l.draw_id = d.id AND NOT l.released AND i.status <> 'draft')`,
    { coopId, start, end },
    t,
  );
  const [closed] = await select<{ closed_at: Date; name: string | null }>(
    `SELECT bp.closed_at, u.name FROM billing_periods bp LEFT JOIN users u ON u.id = bp.closed_by_user_id
     WHERE bp.coop_id = $coopId AND bp.period = $period::date AND bp.status = 'closed'`,
    b,
    t,
  );
  const [running] = await select<{ n: number }>("SELECT count(*)::int AS n FROM billing_runs WHERE coop_id = $coopId AND period = $period::date AND status = 'running'", b, t);

  const monthOver = period < currentPeriod(coop!.timezone);
  const received = int(pay?.received);
  const parts = int(pay?.applied) + int(pay?.credited) + int(pay?.unallocated) + int(pay?.refunded);
  const checks: ReconciliationCheck[] = [
    { label: 'Invoice totals equal the sum of their lines', leftCents: int(inv?.invoiced), rightCents: int(lines?.s), ok: int(inv?.invoiced) === int(lines?.s) },
    {
      label: 'Amount invoiced = paid + outstanding',
      leftCents: int(inv?.invoiced_positive),
      rightCents: int(inv?.paid) + int(inv?.outstanding),
      ok: int(inv?.invoiced_positive) === int(inv?.paid) + int(inv?.outstanding),
    },
    { label: 'Paid on these invoices = payments applied to them', leftCents: int(inv?.paid), rightCents: int(appliedToMonth?.s), ok: int(inv?.paid) === int(appliedToMonth?.s) },
    { label: 'Money received = applied + held as credit + unmatched + refunded', leftCents: received, rightCents: parts, ok: received === parts },
  ];
  const blockers: string[] = [];
  if (!monthOver) blockers.push(`${periodLabel(period)} is not over yet.`);
  if (int(running?.n) > 0) blockers.push('An invoicing run is still working on this month.');
  if (int(inv?.drafts) > 0) blockers.push(`${int(inv?.drafts)} draft invoice(s) are not issued yet.`);
  if (unmatched.length > 0) blockers.push(`${unmatched.length} payment(s) received this month are not matched to an invoice or to credit.`);
  if (int(pending?.attempts) > 0) blockers.push(`${int(pending?.attempts)} card payment(s) are still waiting for the payment service.`);
  if (int(pending?.refunds) > 0) blockers.push(`${int(pending?.refunds)} card refund(s) are still waiting for the payment service.`);
  if (checks.some((c) => !c.ok)) blockers.push('A reconciliation check does not balance.');

  return {
    period,
    closed: Boolean(closed),
    closedAt: closed ? new Date(closed.closed_at).toISOString() : null,
    closedBy: closed?.name ?? null,
    monthOver,
    invoices: {
      rows,
      issuedCount: int(inv?.issued),
      draftCount: int(inv?.drafts),
      invoicedCents: int(inv?.invoiced),
      creditNotesCents: int(inv?.credit_notes),
      paidCents: int(inv?.paid),
      outstandingCents: int(inv?.outstanding),
      unpaidCount: int(inv?.unpaid),
    },
    payments: {
      receivedCents: received,
      byMethod: { card: int(pay?.card), cash: int(pay?.cash), cheque: int(pay?.cheque) },
      appliedCents: int(pay?.applied),
      creditedCents: int(pay?.credited),
      unallocatedCents: int(pay?.unallocated),
      refundedCents: int(pay?.refunded),
      appliedElsewhereCents: int(pay?.elsewhere),
      unmatched,
    },
    pendingCardAttempts: int(pending?.attempts),
    pendingRefunds: int(pending?.refunds),
    unbilledDraws: { count: int(unbilled?.n), totalCents: int(unbilled?.s) },
    checks,
    blockers: closed ? [] : blockers,
  };
}

/**
 * Closes a month: refused (409, with the reasons) until it is over, fully issued, every payment
 * received in it is matched, nothing is in flight with the payment service and every check
 * balances. From then on its draws, invoices and payments are locked (services and database
 * triggers) and corrections go into an open month as adjustments. Unpaid invoices stay payable.
 */
export async function closePeriod(actor: Actor, period: string): Promise<Reconciliation> {
  const coopId = actor.coop.id;
  const periodDate = periodToDate(period);
  await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const recon = await getReconciliation(coopId, period, t);
    if (recon.closed) throw conflict(`${periodLabel(period)} is already closed.`, { code: 'period-closed' });
    if (recon.blockers.length) throw conflict(`${periodLabel(period)} cannot be closed yet.`, { blockers: recon.blockers });
    const summary = {
      invoicedCents: recon.invoices.invoicedCents,
      paidCents: recon.invoices.paidCents,
      outstandingCents: recon.invoices.outstandingCents,
      creditNotesCents: recon.invoices.creditNotesCents,
      receivedCents: recon.payments.receivedCents,
      refundedCents: recon.payments.refundedCents,
      unbilledDraws: recon.unbilledDraws.count,
    };
    await exec(
      `INSERT INTO billing_periods (coop_id, period, status, closed_at, closed_by_user_id, summary) VALUES ($coopId, $period::date, 'closed', now(), $userId, $summary::jsonb)
       ON CONFLICT (coop_id, period) DO UPDATE SET status = 'closed', closed_at = now(), closed_by_user_id = $userId, summary = $summary::jsonb, updated_at = now()`,
      { coopId, period: periodDate, userId: actor.user.id, summary: JSON.stringify(summary) },
      t,
    );
    await audit({ coopId, actorUserId: actor.user.id, action: 'billing.period.close', entityType: 'billing_period', entityId: period, before: { status: 'open' }, after: { status: 'closed', ...summary } }, t);
  });
  return getReconciliation(coopId, period);
}
