import 'server-only';
import { after } from 'next/server';
import type { Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import { queryRows, statement } from '@/lib/db';
import type { Actor } from '@/lib/auth';
import { conflict, HttpError, notFound } from '@/lib/http';
import { sequelize } from '@/models';
import { exec, int, select } from './db';
import { assertPeriodOpen, isPeriodClosed, lockCoopBilling } from './locks';
import { addDays, invoiceLabel, PAYMENT_TERMS_DAYS, periodLabel, periodToDate, todayIn } from './periods';
import { creditLinesSql, latestRun, totalsSql, type RunDTO } from './run';
import type { EmailStatus, InvoiceDetail, InvoiceLineDTO, InvoiceStatus, InvoiceSummary, MemberBalance, PageOf, PaymentDTO } from './types';
import { listPaymentsWhere } from './payments-read';

export interface InvoiceRow {
  id: number; kind: 'invoice' | 'credit-note'; number: number | null; status: InvoiceStatus; period: string; membership_id: number;
  member_name: string; member_email: string; total_cents: string; paid_cents: string; issued_at: Date | null; due_on: string | null;
  email_status: EmailStatus; credit_note_for_id: number | null; credit_note_id: number | null; credit_note_number: number | null;
  original_number: number | null; void_reason: string | null; voided_at: Date | null; emailed_at: Date | null; email_attempts: number;
  today: string;
}

export const INVOICE_SELECT = `
  SELECT i.id, i.kind, i.number, i.status, to_char(i.period, 'YYYY-MM') AS period, i.membership_id, u.name AS member_name, u.email AS member_email,
         i.total_cents, i.paid_cents, i.issued_at, to_char(i.due_on, 'YYYY-MM-DD') AS due_on, i.email_status, i.credit_note_for_id,
         cn.id AS credit_note_id, cn.number AS credit_note_number, orig.number AS original_number, i.void_reason, i.voided_at,
         i.emailed_at, i.email_attempts, to_char(now() AT TIME ZONE c.timezone, 'YYYY-MM-DD') AS today
  FROM invoices i
  JOIN coops c ON c.id = i.coop_id
  JOIN memberships m ON m.id = i.membership_id
  JOIN users u ON u.id = m.user_id
  LEFT JOIN invoices cn ON cn.credit_note_for_id = i.id
  LEFT JOIN invoices orig ON orig.id = i.credit_note_for_id`;

export function toSummary(r: InvoiceRow): InvoiceSummary {
  const total = int(r.total_cents);
  const paid = int(r.paid_cents);
  const open = r.kind === 'invoice' && (r.status === 'issued' || r.status === 'partly-paid');
  const outstanding = open ? Math.max(total - paid, 0) : 0;
  return {
    id: r.id,
    kind: r.kind,
    number: r.number,
    label: invoiceLabel(r.kind, r.number),
    status: r.status,
    period: r.period,
    memberId: r.membership_id,
    memberName: r.member_name,
    memberEmail: r.member_email,
    totalCents: total,
    paidCents: paid,
    outstandingCents: outstanding,
    issuedAt: r.issued_at ? new Date(r.issued_at).toISOString() : null,
    dueOn: r.due_on,
    overdue: outstanding > 0 && r.due_on !== null && r.due_on < r.today,
    emailStatus: r.email_status,
    creditNoteForId: r.credit_note_for_id,
    creditNoteId: r.credit_note_id,
  };
}

const SORTS = {
  number: 'i.number',
  member: 'lower(u.name)',
  total: 'i.total_cents',
  outstanding: "CASE WHEN i.status IN ('issued','partly-paid') THEN GREATEST(i.total_cents - i.paid_cents, 0) ELSE 0 END",
  status: 'i.status',
  period: 'i.period',
} as const;
export type InvoiceSort = keyof typeof SORTS;

/**
 * Invoices and credit notes of the co-op, filtered and paged on the server.
 * @param filter.period 'YYYY-MM'; filter.membershipId limits to one member (their own page)
 */
export async function listInvoices(
  coopId: number,
  filter: { period?: string; status?: InvoiceStatus | 'open'; membershipId?: number; includeDrafts?: boolean; page: number; pageSize: number; sort: InvoiceSort; dir: 'asc' | 'desc' },
): Promise<PageOf<InvoiceSummary>> {
  const where = ['i.coop_id = $coopId'];
  const bind: Record<string, unknown> = { coopId, limit: filter.pageSize, offset: (filter.page - 1) * filter.pageSize };
  if (filter.period) {
    where.push('i.period = $period::date');
    bind.period = periodToDate(filter.period);
  }
  if (filter.status === 'open') where.push("i.status IN ('issued','partly-paid') AND i.kind = 'invoice'");
  else if (filter.status) {
    where.push('i.status = $status');
    bind.status = filter.status;
  }
  if (filter.membershipId) {
    where.push('i.membership_id = $membershipId');
    bind.membershipId = filter.membershipId;
  }
  if (!filter.includeDrafts) where.push("i.status <> 'draft'");
  const w = where.join(' AND ');
  const order = `${SORTS[filter.sort]} ${filter.dir === 'asc' ? 'ASC' : 'DESC'} NULLS LAST, i.id ${filter.dir === 'asc' ? 'ASC' : 'DESC'}`;
  const rows = await select<InvoiceRow>(`${INVOICE_SELECT} WHERE ${w} ORDER BY ${order} LIMIT $limit OFFSET $offset`, bind);
  const [count] = await select<{ n: number }>(
    `SELECT count(*)::int AS n FROM invoices i JOIN memberships m ON m.id = i.membership_id JOIN users u ON u.id = m.user_id WHERE ${w}`,
    bind,
  );
  return { rows: rows.map(toSummary), total: count?.n ?? 0, page: filter.page, pageSize: filter.pageSize };
}

async function loadInvoiceRow(coopId: number, id: number, opts: { membershipId?: number; includeDrafts: boolean }, t?: Transaction): Promise<InvoiceRow> {
  const rows = await select<InvoiceRow>(
    `${INVOICE_SELECT} WHERE i.id = $id AND i.coop_id = $coopId ${opts.membershipId ? 'AND i.membership_id = $membershipId' : ''} ${opts.includeDrafts ? '' : "AND i.status <> 'draft'"}`,
    { id, coopId, membershipId: opts.membershipId },
    t,
  );
  if (!rows[0]) throw notFound('Invoice not found.');
  return rows[0];
}

/**
 * One invoice with its lines, payments and card-attempt state. With `membershipId` only that
 * member's invoice is found (another's is a 404); drafts only for the treasurer.
 */
export async function getInvoiceDetail(coopId: number, id: number, opts: { membershipId?: number; includeDrafts: boolean }): Promise<InvoiceDetail> {
  const r = await loadInvoiceRow(coopId, id, opts);
  const lines = await select<{ id: string; kind: InvoiceLineDTO['kind']; description: string; occurred_at: Date | null; quantity_liters: string | null; unit_price_cents_per_gallon: string | null; amount_cents: string }>(
    'SELECT id, kind, description, occurred_at, quantity_liters, unit_price_cents_per_gallon, amount_cents FROM invoice_lines WHERE invoice_id = $id AND coop_id = $coopId ORDER BY sort_key, id',
    { id, coopId },
  );
  const payments: PaymentDTO[] = await listPaymentsWhere(coopId, 'p.invoice_id = $invoiceId', { invoiceId: id });
  const [pending] = await select<{ id: number; created_at: Date }>(
    "SELECT id, created_at FROM payment_attempts WHERE invoice_id = $id AND coop_id = $coopId AND status = 'pending'",
    { id, coopId },
  );
  const [failed] = await select<{ failure_message: string | null; completed_at: Date }>(
    "SELECT failure_message, completed_at FROM payment_attempts WHERE invoice_id = $id AND coop_id = $coopId AND status = 'failed' ORDER BY id DESC LIMIT 1",
    { id, coopId },
  );
  const lastSucceeded = await select<{ n: number }>("SELECT count(*)::int AS n FROM payment_attempts WHERE invoice_id = $id AND status = 'succeeded'", { id });
  return {
    ...toSummary(r),
    lines: lines.map((l) => ({
      id: String(l.id),
      kind: l.kind,
      description: l.description,
      occurredAt: l.occurred_at ? new Date(l.occurred_at).toISOString() : null,
      quantityLiters: l.quantity_liters === null ? null : Number(l.quantity_liters),
      unitPriceCentsPerGallon: l.unit_price_cents_per_gallon === null ? null : Number(l.unit_price_cents_per_gallon),
      amountCents: int(l.amount_cents),
    })),
    payments,
    pendingAttempt: pending ? { id: pending.id, createdAt: new Date(pending.created_at).toISOString() } : null,
    lastFailedAttempt: failed && (lastSucceeded[0]?.n ?? 0) === 0 ? { message: failed.failure_message ?? 'The card was declined.', at: new Date(failed.completed_at).toISOString() } : null,
    voidReason: r.void_reason,
    voidedAt: r.voided_at ? new Date(r.voided_at).toISOString() : null,
    creditNote: r.credit_note_id ? { id: r.credit_note_id, label: invoiceLabel('credit-note', r.credit_note_number) } : null,
    original: r.credit_note_for_id ? { id: r.credit_note_for_id, label: invoiceLabel('invoice', r.original_number) } : null,
    periodClosed: await isPeriodClosed(coopId, `${r.period}-01`),
    emailedAt: r.emailed_at ? new Date(r.emailed_at).toISOString() : null,
    emailAttempts: r.email_attempts,
  };
}

/** Outstanding, credit and unmatched money of one member. */
export const MEMBER_BALANCE = statement(
  `SELECT
     (SELECT COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)), 0) FROM invoices
       WHERE coop_id = $1 AND membership_id = $2 AND kind = 'invoice' AND status IN ('issued','partly-paid')) AS outstanding,
     (SELECT COALESCE(SUM(amount_cents), 0) FROM member_credits WHERE coop_id = $1 AND membership_id = $2) AS credit,
     (SELECT COALESCE(SUM(unallocated_cents), 0) FROM payments WHERE coop_id = $1 AND membership_id = $2) AS unallocated`,
  'tv_member_balance',
);

/** A member's balance from the MEMBER_BALANCE row. */
export function memberBalanceOf(r: { outstanding: string; credit: string; unallocated: string } | undefined): MemberBalance {
  return { outstandingCents: int(r?.outstanding), creditCents: int(r?.credit), unallocatedCents: int(r?.unallocated) };
}

export async function memberBalance(coopId: number, membershipId: number, t?: Transaction): Promise<MemberBalance> {
  return memberBalanceOf((await queryRows<{ outstanding: string; credit: string; unallocated: string }>(MEMBER_BALANCE, [coopId, membershipId], t))[0]);
}

/** Takes the next `count` numbers from the co-op's counter (row locked until the transaction ends). */
async function takeNumbers(t: Transaction, coopId: number, count: number): Promise<number> {
  await exec('INSERT INTO invoice_counters (coop_id) VALUES ($coopId) ON CONFLICT (coop_id) DO NOTHING', { coopId }, t);
  const [ctr] = await select<{ last_number: number }>('SELECT last_number FROM invoice_counters WHERE coop_id = $coopId FOR UPDATE', { coopId }, t);
  await exec('UPDATE invoice_counters SET last_number = last_number + $count, updated_at = now() WHERE coop_id = $coopId', { coopId, count }, t);
  return ctr!.last_number;
}

/**
 * Issues every draft of a month in one transaction: re-applies member credit at today's
 * balances, takes consecutive numbers from the co-op's counter (ordered by member name), sets
 * the due date, records credit used, and queues the e-mails (sent after the response).
 */
export async function issueDrafts(actor: Actor, period: string): Promise<{ issued: number; firstNumber: string | null; lastNumber: string | null }> {
  const coopId = actor.coop.id;
  const periodDate = periodToDate(period);
  const out = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertPeriodOpen(coopId, periodDate, t);
    const [running] = await select<{ id: number }>(
      "SELECT id FROM billing_runs WHERE coop_id = $coopId AND period = $period::date AND status = 'running'",
      { coopId, period: periodDate },
      t,
    );
    if (running) throw conflict(`Invoices for ${periodLabel(period)} are still being prepared; issue them when the run has finished.`);
    const drafts = await select<{ id: number; membership_id: number }>(
      "SELECT id, membership_id FROM invoices WHERE coop_id = $coopId AND period = $period::date AND kind = 'invoice' AND status = 'draft' FOR UPDATE",
      { coopId, period: periodDate },
      t,
    );
    if (drafts.length === 0) throw conflict(`There are no draft invoices for ${periodLabel(period)} to issue.`);
    const b = { coopId, period: periodDate };
    const isDraft = "i.coop_id = $coopId AND i.period = $period::date AND i.kind = 'invoice' AND i.status = 'draft'";
    await exec(`DELETE FROM invoice_lines l USING invoices i WHERE l.invoice_id = i.id AND ${isDraft} AND l.kind = 'credit'`, b, t);
    await exec(creditLinesSql(isDraft), b, t);
    await exec(totalsSql(isDraft.replaceAll('i.', 'i2.')), b, t);
    await exec(
      `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, invoice_id, created_by_user_id)
       SELECT $coopId, i.membership_id, l.amount_cents, 'applied', i.id, $userId
       FROM invoice_lines l JOIN invoices i ON i.id = l.invoice_id WHERE ${isDraft} AND l.kind = 'credit' AND l.amount_cents <> 0`,
      { ...b, userId: actor.user.id },
      t,
    );
    const last = await takeNumbers(t, coopId, drafts.length);
    const issued = await exec(
      `WITH numbered AS (
         SELECT i.id, row_number() OVER (ORDER BY lower(u.name), i.id) AS rn
         FROM invoices i JOIN memberships m ON m.id = i.membership_id JOIN users u ON u.id = m.user_id WHERE ${isDraft})
       UPDATE invoices i SET number = $last + n.rn, issued_at = now(), due_on = $dueOn::date, email_status = 'queued', updated_at = now(),
         status = CASE WHEN i.total_cents <= 0 THEN 'paid' ELSE 'issued' END
       FROM numbered n WHERE i.id = n.id`,
      { ...b, last, dueOn: addDays(todayIn(actor.coop.timezone), PAYMENT_TERMS_DAYS) },
      t,
    );
    if (issued !== drafts.length) throw new Error(`issued ${issued} of ${drafts.length} drafts`);
    // An invoice whose lines come to less than zero (e.g. only a reversal) leaves the member in credit.
    await exec(
      `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, invoice_id, created_by_user_id)
       SELECT $coopId, membership_id, -total_cents, 'negative-invoice', id, $userId FROM invoices
       WHERE coop_id = $coopId AND kind = 'invoice' AND number > $last AND number <= $last + $n AND total_cents < 0`,
      { coopId, last, n: drafts.length, userId: actor.user.id },
      t,
    );
    const first = invoiceLabel('invoice', last + 1);
    const lastLabel = invoiceLabel('invoice', last + drafts.length);
    await audit({ coopId, actorUserId: actor.user.id, action: 'invoices.issue', entityType: 'billing_period', entityId: period, before: { drafts: drafts.length }, after: { issued: drafts.length, firstNumber: first, lastNumber: lastLabel } }, t);
    return { issued: drafts.length, firstNumber: first, lastNumber: lastLabel };
  });
  after(async () => {
    const { sendQueuedInvoiceEmails } = await import('./mail');
    await sendQueuedInvoiceEmails(coopId);
  });
  return out;
}

/**
 * Voids an issued invoice with a credit note (never by deleting): the credit note takes the
 * next number and mirrors every line negatively; the invoice's draws and adjustments are
 * released so a new invoice can bill them; credit it used comes back and payments applied to it
 * become member credit. Refused (409) in a closed month — use an adjustment instead.
 */
export async function voidInvoice(actor: Actor, id: number, reason: string): Promise<{ invoiceId: number; creditNoteId: number; creditNoteLabel: string | null }> {
  const coopId = actor.coop.id;
  const out = await sequelize.transaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const [inv] = await select<{ id: number; kind: string; status: InvoiceStatus; period: string; membership_id: number; total_cents: string; paid_cents: string; number: number }>(
      'SELECT id, kind, status, to_char(period, \'YYYY-MM-DD\') AS period, membership_id, total_cents, paid_cents, number FROM invoices WHERE id = $id AND coop_id = $coopId FOR UPDATE',
      { id, coopId },
      t,
    );
    if (!inv) throw notFound('Invoice not found.');
    if (inv.kind !== 'invoice') throw conflict('A credit note cannot be voided.');
    if (inv.status === 'draft') throw conflict('Drafts are not voided: run the month again to rebuild them, or issue them.');
    if (inv.status === 'void') throw conflict('This invoice is already void.');
    await assertPeriodOpen(coopId, inv.period, t);
    const [pending] = await select<{ id: number }>("SELECT id FROM payment_attempts WHERE invoice_id = $id AND status = 'pending'", { id }, t);
    if (pending) throw conflict('A card payment for this invoice is still being processed; try again in a minute.');
    const total = int(inv.total_cents);
    if (total < 0) {
      const bal = await memberBalance(coopId, inv.membership_id, t);
      if (bal.creditCents < -total) throw conflict('The credit this invoice gave the member has already been used or refunded, so it cannot be voided. Add an adjustment instead.');
    }
    const [cn] = await select<{ id: number }>(
      `INSERT INTO invoices (coop_id, membership_id, period, kind, status, credit_note_for_id, total_cents, created_at, updated_at)
       VALUES ($coopId, $m, $period::date, 'credit-note', 'draft', $id, $total, now(), now()) RETURNING id`,
      { coopId, m: inv.membership_id, period: inv.period, id, total: -total },
      t,
    );
    await exec(
      `INSERT INTO invoice_lines (coop_id, invoice_id, sort_key, kind, description, occurred_at, quantity_liters, unit_price_cents_per_gallon, amount_cents)
       SELECT coop_id, $cn, sort_key, kind, description, occurred_at, -quantity_liters, unit_price_cents_per_gallon, -amount_cents
       FROM invoice_lines WHERE invoice_id = $id AND coop_id = $coopId`,
      { cn: cn!.id, id, coopId },
      t,
    );
    const last = await takeNumbers(t, coopId, 1);
    await exec(
      `UPDATE invoices SET number = $n, status = 'issued', issued_at = now(), email_status = 'queued', updated_at = now() WHERE id = $cn`,
      { n: last + 1, cn: cn!.id },
      t,
    );
    await exec(`UPDATE invoices SET status = 'void', voided_at = now(), void_reason = $reason, paid_cents = 0, updated_at = now() WHERE id = $id`, { id, reason }, t);
    await exec('UPDATE invoice_lines SET released = true WHERE invoice_id = $id AND (draw_id IS NOT NULL OR adjustment_id IS NOT NULL)', { id }, t);
    // Money the invoice held goes back to the member's credit.
    await exec(
      `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, invoice_id, created_by_user_id)
       SELECT $coopId, $m, -SUM(amount_cents), 'void-restore', $id, $userId FROM invoice_lines WHERE invoice_id = $id AND kind = 'credit'
       HAVING SUM(amount_cents) < 0`,
      { coopId, m: inv.membership_id, id, userId: actor.user.id },
      t,
    );
    const applied = await select<{ id: number; applied_cents: string }>(
      'SELECT id, applied_cents FROM payments WHERE invoice_id = $id AND coop_id = $coopId AND applied_cents > 0 FOR UPDATE',
      { id, coopId },
      t,
    );
    for (const p of applied) {
      await exec('UPDATE payments SET credited_cents = credited_cents + applied_cents, applied_cents = 0, updated_at = now() WHERE id = $pid', { pid: p.id }, t);
      await exec(
        `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, payment_id, invoice_id, created_by_user_id) VALUES ($coopId, $m, $amount, 'void-restore', $pid, $id, $userId)`,
        { coopId, m: inv.membership_id, amount: int(p.applied_cents), pid: p.id, id, userId: actor.user.id },
        t,
      );
    }
    if (total < 0) {
      await exec(
        `INSERT INTO member_credits (coop_id, membership_id, amount_cents, kind, invoice_id, created_by_user_id) VALUES ($coopId, $m, $amount, 'void-reverse', $id, $userId)`,
        { coopId, m: inv.membership_id, amount: total, id, userId: actor.user.id },
        t,
      );
    }
    const label = invoiceLabel('credit-note', last + 1);
    await audit({
      coopId, actorUserId: actor.user.id, action: 'invoice.void', entityType: 'invoice', entityId: id,
      before: { status: inv.status, totalCents: total, paidCents: int(inv.paid_cents) },
      after: { status: 'void', reason, creditNoteId: cn!.id, creditNote: label, paymentsMovedToCredit: applied.map((p) => p.id) },
    }, t);
    return { invoiceId: id, creditNoteId: cn!.id, creditNoteLabel: label };
  });
  after(async () => {
    const { sendQueuedInvoiceEmails } = await import('./mail');
    await sendQueuedInvoiceEmails(coopId);
  });
  return out;
}

/** What the month page polls: run progress, counts by status and e-mail state. */
export interface PeriodOverview {
  period: string;
  closed: boolean;
  closedAt: string | null;
  run: RunDTO | null;
  counts: { draft: number; issued: number; partlyPaid: number; paid: number; void: number; creditNotes: number };
  email: { queued: number; sending: number; sent: number; failed: number; notSent: number };
  totals: { invoicedCents: number; paidCents: number; outstandingCents: number; draftCents: number };
}

export async function getPeriodOverview(coopId: number, period: string): Promise<PeriodOverview> {
  const periodDate = periodToDate(period);
  const [c] = await select<Record<string, string>>(
    `SELECT
       count(*) FILTER (WHERE kind = 'invoice' AND status = 'draft') AS draft,
       count(*) FILTER (WHERE kind = 'invoice' AND status = 'issued') AS issued,
       count(*) FILTER (WHERE kind = 'invoice' AND status = 'partly-paid') AS partly_paid,
       count(*) FILTER (WHERE kind = 'invoice' AND status = 'paid') AS paid,
       count(*) FILTER (WHERE kind = 'invoice' AND status = 'void') AS void,
       count(*) FILTER (WHERE kind = 'credit-note') AS credit_notes,
       count(*) FILTER (WHERE email_status = 'queued') AS queued,
       count(*) FILTER (WHERE email_status = 'sending') AS sending,
       count(*) FILTER (WHERE email_status = 'sent') AS sent,
       count(*) FILTER (WHERE email_status = 'failed') AS failed,
       count(*) FILTER (WHERE email_status = 'not-sent' AND status <> 'draft') AS not_sent,
       COALESCE(SUM(total_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS invoiced,
       COALESCE(SUM(paid_cents) FILTER (WHERE kind = 'invoice' AND status NOT IN ('draft','void')), 0) AS paid_cents,
       COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)) FILTER (WHERE kind = 'invoice' AND status IN ('issued','partly-paid')), 0) AS outstanding,
       COALESCE(SUM(total_cents) FILTER (WHERE kind = 'invoice' AND status = 'draft'), 0) AS draft_cents
     FROM invoices WHERE coop_id = $coopId AND period = $period::date`,
    { coopId, period: periodDate },
  );
  const [closed] = await select<{ closed_at: Date }>("SELECT closed_at FROM billing_periods WHERE coop_id = $coopId AND period = $period::date AND status = 'closed'", { coopId, period: periodDate });
  return {
    period,
    closed: Boolean(closed),
    closedAt: closed ? new Date(closed.closed_at).toISOString() : null,
    run: await latestRun(coopId, periodDate),
    counts: { draft: int(c?.draft), issued: int(c?.issued), partlyPaid: int(c?.partly_paid), paid: int(c?.paid), void: int(c?.void), creditNotes: int(c?.credit_notes) },
    email: { queued: int(c?.queued), sending: int(c?.sending), sent: int(c?.sent), failed: int(c?.failed), notSent: int(c?.not_sent) },
    totals: { invoicedCents: int(c?.invoiced), paidCents: int(c?.paid_cents), outstandingCents: int(c?.outstanding), draftCents: int(c?.draft_cents) },
  };
}

/** Months that have invoices, runs or a close, newest first (the billing overview). */
export async function listPeriods(coopId: number): Promise<{ period: string; closed: boolean; invoices: number; drafts: number; outstandingCents: number }[]> {
  const rows = await select<{ period: string; closed: boolean; invoices: number; drafts: number; outstanding: string }>(
    `WITH months AS (
       SELECT period FROM invoices WHERE coop_id = $coopId
       UNION SELECT period FROM billing_runs WHERE coop_id = $coopId
       UNION SELECT period FROM billing_periods WHERE coop_id = $coopId)
     SELECT to_char(mo.period, 'YYYY-MM') AS period,
       EXISTS (SELECT 1 FROM billing_periods bp WHERE bp.coop_id = $coopId AND bp.period = mo.period AND bp.status = 'closed') AS closed,
       (SELECT count(*)::int FROM invoices i WHERE i.coop_id = $coopId AND i.period = mo.period AND i.kind = 'invoice' AND i.status NOT IN ('draft','void')) AS invoices,
       (SELECT count(*)::int FROM invoices i WHERE i.coop_id = $coopId AND i.period = mo.period AND i.status = 'draft') AS drafts,
       (SELECT COALESCE(SUM(GREATEST(total_cents - paid_cents, 0)), 0) FROM invoices i WHERE i.coop_id = $coopId AND i.period = mo.period AND i.kind = 'invoice' AND i.status IN ('issued','partly-paid')) AS outstanding
     FROM months mo ORDER BY mo.period DESC LIMIT 36`,
    { coopId },
  );
  return rows.map((r) => ({ period: r.period, closed: r.closed, invoices: r.invoices, drafts: r.drafts, outstandingCents: int(r.outstanding) }));
}

/** Members of the co-op for the treasurer's pickers (payments, adjustments). */
export async function listMembersForBilling(coopId: number): Promise<{ id: number; name: string; email: string; status: string }[]> {
  return select<{ id: number; name: string; email: string; status: string }>(
    'SELECT m.id, u.name, u.email, m.status FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.coop_id = $coopId ORDER BY lower(u.name), m.id',
    { coopId },
  );
}

/** 404 unless the membership belongs to the co-op. */
export async function assertMember(coopId: number, membershipId: number, t?: Transaction): Promise<void> {
  const [m] = await select<{ id: number }>('SELECT id FROM memberships WHERE id = $id AND coop_id = $coopId', { id: membershipId, coopId }, t);
  if (!m) throw new HttpError(422, 'Some fields need attention.', { memberId: ['Choose a member of this co-op.'] });
}
