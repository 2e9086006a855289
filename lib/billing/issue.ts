import 'server-only';
import { after } from 'next/server';
import { Op, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { invoicesIssuedSchema, invoiceVoidedSchema } from '@/lib/api/dto/billing';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, notFound } from '@/lib/http';
import { BillingRun, Invoice, InvoiceCounter, InvoiceLine, MemberCredit, Payment, PaymentAttempt } from '@/models';
import { cents } from './cents';
import { memberBalance } from './invoices';
import { assertPeriodOpen, lockCoopBilling } from './locks';
import { sendQueuedInvoiceEmails } from './mail';
import { addDays, invoiceLabel, PAYMENT_TERMS_DAYS, periodLabel, periodToDate } from './periods';
import { todayIn } from '@/lib/dates';
import { insertCreditLines, numberAndIssueDrafts, refreshDraftTotals } from './run/queries';

/**
 * Takes the next `count` numbers from the co-op's counter; the counter row stays locked until the
 * transaction ends, so numbers are consecutive and never reused.
 * @returns the last number given out before these (the new ones are `last + 1 … last + count`)
 */
async function takeNumbers(t: Transaction, coopId: number, count: number): Promise<number> {
  await InvoiceCounter.bulkCreate([{ coopId }], { ignoreDuplicates: true, transaction: t });
  const counter = await InvoiceCounter.findOne({ where: { coopId }, lock: t.LOCK.UPDATE, transaction: t });
  const last = counter!.lastNumber;
  await counter!.increment('lastNumber', { by: count, transaction: t });
  return last;
}

/** Mails what a committed write queued, after the response. */
function mailQueuedAfterResponse(coopId: number): void {
  after(() => sendQueuedInvoiceEmails(coopId));
}

/**
 * Issues every draft of a month in one transaction: re-applies member credit at today's
 * balances, takes consecutive numbers from the co-op's counter (ordered by member name), sets
 * the due date, records credit used, and queues the e-mails (sent after the response).
 */
export async function issueDrafts(actor: Actor, period: string): Promise<z.infer<typeof invoicesIssuedSchema>> {
  const coopId = actor.coop.id;
  const periodDate = periodToDate(period);
  const out = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    await assertPeriodOpen(coopId, periodDate, t);
    const running = await BillingRun.findOne({
      where: { coopId, period: periodDate, status: 'running' },
      attributes: ['id'],
      transaction: t,
    });
    if (running)
      throw conflict(
        `Invoices for ${periodLabel(period)} are still being prepared; issue them when the run has finished.`,
      );
    const drafts = await Invoice.findAll({
      where: { coopId, period: periodDate, kind: 'invoice', status: 'draft' },
      attributes: ['id', 'membershipId'],
      lock: t.LOCK.UPDATE,
      raw: true,
      transaction: t,
    });
    if (drafts.length === 0) throw conflict(`There are no draft invoices for ${periodLabel(period)} to issue.`);
    const ids = drafts.map((d) => d.id);
    const memberOf = new Map(drafts.map((d) => [d.id, d.membershipId]));
    // Credit is applied again at today's balances (payments may have arrived since the run).
    await InvoiceLine.destroy({ where: { coopId, invoiceId: ids, kind: 'credit' }, transaction: t });
    await insertCreditLines(t, coopId, ids);
    await refreshDraftTotals(t, coopId, ids);
    const creditLines = await InvoiceLine.findAll({
      where: { coopId, invoiceId: ids, kind: 'credit', amountCents: { [Op.ne]: 0 } },
      attributes: ['invoiceId', 'amountCents'],
      raw: true,
      transaction: t,
    });
    await MemberCredit.bulkCreate(
      creditLines.map((l) => ({
        coopId,
        membershipId: memberOf.get(l.invoiceId)!,
        amountCents: cents(l.amountCents),
        kind: 'applied' as const,
        invoiceId: l.invoiceId,
        createdByUserId: actor.user.id,
      })),
      { transaction: t },
    );
    const last = await takeNumbers(t, coopId, drafts.length);
    const issued = await numberAndIssueDrafts(
      t,
      coopId,
      ids,
      last,
      addDays(todayIn(actor.coop.timezone), PAYMENT_TERMS_DAYS),
    );
    if (issued !== drafts.length) throw new Error(`issued ${issued} of ${drafts.length} drafts`);
    // An invoice whose lines come to less than zero (e.g. only a reversal) leaves the member in credit.
    const negative = await Invoice.findAll({
      where: { coopId, id: ids, totalCents: { [Op.lt]: 0 } },
      attributes: ['id', 'membershipId', 'totalCents'],
      raw: true,
      transaction: t,
    });
    await MemberCredit.bulkCreate(
      negative.map((i) => ({
        coopId,
        membershipId: i.membershipId,
        amountCents: -cents(i.totalCents),
        kind: 'negative-invoice' as const,
        invoiceId: i.id,
        createdByUserId: actor.user.id,
      })),
      { transaction: t },
    );
    const first = invoiceLabel('invoice', last + 1);
    const lastLabel = invoiceLabel('invoice', last + drafts.length);
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'invoices.issue',
        entityType: 'billing_period',
        entityId: period,
        before: { drafts: drafts.length },
        after: { issued: drafts.length, firstNumber: first, lastNumber: lastLabel },
      },
      t,
    );
    return { issued: drafts.length, firstNumber: first, lastNumber: lastLabel };
  });
  mailQueuedAfterResponse(coopId);
  return out;
}

/** A line's quantity negated, kept as the exact NUMERIC text ('12.500' → '-12.500'). */
const negateDecimal = (v: string | null): string | null =>
  v === null ? null : v.startsWith('-') ? v.slice(1) : `-${v}`;

/**
 * Voids an issued invoice with a credit note (never by deleting): the credit note takes the
 * next number and mirrors every line negatively; the invoice's draws and adjustments are
 * released so a new invoice can bill them; credit it used comes back and payments applied to it
 * become member credit. Refused (409) in a closed month — use an adjustment instead.
 */
export async function voidInvoice(
  actor: Actor,
  id: number,
  reason: string,
): Promise<z.infer<typeof invoiceVoidedSchema>> {
  const coopId = actor.coop.id;
  const userId = actor.user.id;
  const out = await inTransaction(async (t) => {
    await lockCoopBilling(t, coopId);
    const inv = await Invoice.findOne({ where: { id, coopId }, lock: t.LOCK.UPDATE, transaction: t });
    if (!inv) throw notFound('Invoice not found.');
    if (inv.kind !== 'invoice') throw conflict('A credit note cannot be voided.');
    if (inv.status === 'draft')
      throw conflict('Drafts are not voided: run the month again to rebuild them, or issue them.');
    if (inv.status === 'void') throw conflict('This invoice is already void.');
    await assertPeriodOpen(coopId, inv.period, t);
    if (
      await PaymentAttempt.findOne({
        where: { invoiceId: id, coopId, status: 'pending' },
        attributes: ['id'],
        transaction: t,
      })
    ) {
      throw conflict('A card payment for this invoice is still being processed; try again in a minute.');
    }
    const total = cents(inv.totalCents);
    const membershipId = inv.membershipId;
    const before = { status: inv.status, totalCents: total, paidCents: cents(inv.paidCents) };
    if (total < 0) {
      const bal = await memberBalance(coopId, membershipId, t);
      if (bal.creditCents < -total)
        throw conflict(
          'The credit this invoice gave the member has already been used or refunded, so it cannot be voided. Add an adjustment instead.',
        );
    }
    // The credit note is built as a draft (lines change only on drafts), then issued with the next number.
    const lines = await InvoiceLine.findAll({
      where: { invoiceId: id, coopId },
      order: [
        ['sortKey', 'ASC'],
        ['id', 'ASC'],
      ],
      raw: true,
      transaction: t,
    });
    const cn = await Invoice.create(
      {
        coopId,
        membershipId,
        period: inv.period,
        kind: 'credit-note',
        status: 'draft',
        creditNoteForId: id,
        totalCents: String(-total),
      },
      { transaction: t },
    );
    await InvoiceLine.bulkCreate(
      lines.map((l) => ({
        coopId,
        invoiceId: cn.id,
        sortKey: l.sortKey,
        kind: l.kind,
        description: l.description,
        occurredAt: l.occurredAt,
        quantityLiters: negateDecimal(l.quantityLiters),
        unitPriceCentsPerGallon: l.unitPriceCentsPerGallon,
        amountCents: -cents(l.amountCents),
      })),
      { transaction: t },
    );
    const last = await takeNumbers(t, coopId, 1);
    await cn.update(
      { number: last + 1, status: 'issued', issuedAt: new Date(), emailStatus: 'queued' },
      { transaction: t },
    );
    await inv.update({ status: 'void', voidedAt: new Date(), voidReason: reason, paidCents: '0' }, { transaction: t });
    await InvoiceLine.update(
      { released: true },
      {
        where: { invoiceId: id, coopId, [Op.or]: [{ drawId: { [Op.ne]: null } }, { adjustmentId: { [Op.ne]: null } }] },
        transaction: t,
      },
    );
    // Money the invoice held goes back to the member's credit: the credit it used, then payments applied to it.
    const creditUsed = lines.filter((l) => l.kind === 'credit').reduce((s, l) => s + cents(l.amountCents), 0);
    if (creditUsed < 0)
      await MemberCredit.create(
        {
          coopId,
          membershipId,
          amountCents: -creditUsed,
          kind: 'void-restore',
          invoiceId: id,
          createdByUserId: userId,
        },
        { transaction: t },
      );
    const applied = await Payment.findAll({
      where: { invoiceId: id, coopId, appliedCents: { [Op.gt]: 0 } },
      order: [['id', 'ASC']],
      lock: t.LOCK.UPDATE,
      transaction: t,
    });
    for (const p of applied) {
      const amount = cents(p.appliedCents);
      await p.update({ creditedCents: cents(p.creditedCents) + amount, appliedCents: 0 }, { transaction: t });
      await MemberCredit.create(
        {
          coopId,
          membershipId,
          amountCents: amount,
          kind: 'void-restore',
          paymentId: p.id,
          invoiceId: id,
          createdByUserId: userId,
        },
        { transaction: t },
      );
    }
    if (total < 0)
      await MemberCredit.create(
        { coopId, membershipId, amountCents: total, kind: 'void-reverse', invoiceId: id, createdByUserId: userId },
        { transaction: t },
      );
    const label = invoiceLabel('credit-note', last + 1);
    await audit(
      {
        coopId,
        actorUserId: userId,
        action: 'invoice.void',
        entityType: 'invoice',
        entityId: id,
        before,
        after: {
          status: 'void',
          reason,
          creditNoteId: cn.id,
          creditNote: label,
          paymentsMovedToCredit: applied.map((p) => p.id),
        },
      },
      t,
    );
    return { invoiceId: id, creditNoteId: cn.id, creditNoteLabel: label };
  });
  mailQueuedAfterResponse(coopId);
  return out;
}
