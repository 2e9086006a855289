import 'server-only';
import { literal, Op } from 'sequelize';
import { enqueueInvoiceMails } from '@/lib/jobs';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, notFound } from '@/lib/http';
import { appUrl, type OutgoingMail } from '@/lib/mail';
import { sendOnce } from '@/lib/mail/once';
import { formatCents } from '@/lib/money';
import { Coop, Invoice } from '@/models';
import { getInvoiceDetail } from './invoices';
import { invoiceFileName, renderInvoicePdf, type PdfCoop } from './pdf';
import { periodLabel } from './periods';
import { formatDate } from '@/lib/dates';

async function loadCoop(coopId: number): Promise<PdfCoop> {
  const c = await Coop.findByPk(coopId, { attributes: ['name', 'slug', 'units', 'currency', 'timezone'], raw: true });
  return c!;
}

/** One more sending attempt, counted in the database (concurrent senders never lose one). */
const ATTEMPT = literal('email_attempts + 1');

/** The e-mail of one issued invoice or credit note, with its PDF. */
async function composeInvoiceEmail(coopId: number, invoiceId: number): Promise<OutgoingMail> {
  const c = await loadCoop(coopId);
  const inv = await getInvoiceDetail(coopId, invoiceId, { includeDrafts: false });
  const pdf = await renderInvoicePdf(inv, c);
  const isCredit = inv.kind === 'credit-note';
  const money = (n: number) => formatCents(n, c.currency);
  const first = inv.memberName.split(/\s+/)[0] || inv.memberName;
  const text = isCredit
    ? `Hello ${first},\n\n${c.name} has cancelled invoice ${inv.original?.label ?? ''} for ${periodLabel(inv.period)}. The credit note ${inv.label} is attached.\nAnything you had paid on that invoice is held as credit on your account and taken off your next invoice.\n\nYour invoices: ${appUrl(`/c/${c.slug}/invoices`)}\n\n— ${c.name} (sent by Tallyvat)\n`
    : `Hello ${first},\n\nYour invoice ${inv.label} for ${periodLabel(inv.period)} from ${c.name} is attached.\nTotal: ${money(inv.totalCents)}. Amount due: ${money(inv.outstandingCents)}${inv.dueOn && inv.outstandingCents > 0 ? `, by ${formatDate(inv.dueOn, c.timezone)}` : ''}.\n\nPay by card or see all your invoices: ${appUrl(`/c/${c.slug}/invoices/${inv.id}`)}\nOr pay the treasurer in cash or by cheque, writing ${inv.label} on it.\n\n— ${c.name} (sent by Tallyvat)\n`;
  return {
    to: inv.memberEmail,
    subject: `${c.name}: ${isCredit ? 'credit note' : 'invoice'} ${inv.label} for ${periodLabel(inv.period)}`,
    text,
    attachments: [{ filename: invoiceFileName(c.slug, inv), content: pdf, contentType: 'application/pdf' }],
  };
}

/**
 * The treasurer's "send again" on one issued invoice or credit note: puts its e-mail back to
 * "queued" and queues its mail job in the same transaction (like the month's bulk send); the
 * worker sends it through the ledger as the next generation. 409 while a send is in flight;
 * an invoice already queued with a live job gets no second one.
 * @returns the e-mail status now (queued); the invoice page follows it from there
 */
export async function queueInvoiceEmail(actor: Actor, invoiceId: number): Promise<{ emailStatus: 'queued' }> {
  const coopId = actor.coop.id;
  return inTransaction(async (transaction) => {
    const inv = await Invoice.findOne({
      attributes: ['id', 'emailStatus'],
      where: { id: invoiceId, coopId, status: { [Op.ne]: 'draft' } },
      lock: transaction.LOCK.UPDATE,
      transaction,
    });
    if (!inv) throw notFound('That invoice is not in this co-op, or it is still a draft.');
    const before = inv.emailStatus;
    if (before === 'sending') throw conflict('This e-mail is being sent right now. Wait a moment and look again.');
    if (before !== 'queued') await inv.update({ emailStatus: 'queued' }, { transaction });
    await enqueueInvoiceMails(coopId, [invoiceId], transaction, before !== 'queued');
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'invoice.email',
        entityType: 'invoice',
        entityId: invoiceId,
        before: { emailStatus: before },
        after: { emailStatus: 'queued' },
      },
      transaction,
    );
    return { emailStatus: 'queued' as const };
  });
}

/**
 * The mail job of one invoice (run by the worker), through the send ledger (lib/mail/once.ts): a
 * job for an invoice already sent does nothing; the e-mail is composed (reads and the PDF), then
 * the invoice is marked "sending" with the in-flight claim, the message goes out with the
 * Message-ID of the invoice's n-th send, and "sent" is committed right after the server's 250.
 * A worker killed in between leaves it "sending": the retry sends it again with the same
 * Message-ID (logged `mail.ambiguous`). SMTP trouble throws: the queue tries again with
 * back-off, and after the last try the dead letter marks the invoice "failed".
 * @param jobRef the job, `queue:id`
 * @returns whether this job sent the e-mail
 */
export async function deliverInvoiceEmailJob(coopId: number, invoiceId: number, jobRef: string): Promise<boolean> {
  const waiting = { id: invoiceId, coopId, status: { [Op.ne]: 'draft' }, emailStatus: ['queued', 'sending'] };
  if ((await Invoice.count({ where: waiting })) === 0) return false;
  const mail = await composeInvoiceEmail(coopId, invoiceId);
  // The claim counts the try (the month page shows attempts).
  return sendOnce({
    subject: `invoice.${invoiceId}`,
    coopId,
    jobRef,
    mail,
    claim: async (transaction) =>
      (await Invoice.update({ emailStatus: 'sending', emailAttempts: ATTEMPT }, { where: waiting, transaction }))[0] >
      0,
    sent: (transaction) =>
      Invoice.update(
        { emailStatus: 'sent', emailedAt: new Date() },
        { where: { id: invoiceId, coopId, emailStatus: 'sending' }, transaction },
      ),
    unsent: (transaction) =>
      Invoice.update(
        { emailStatus: 'queued' },
        { where: { id: invoiceId, coopId, emailStatus: 'sending' }, transaction },
      ),
  });
}

/** The dead letter of an invoice's mail job: every try failed. */
export async function invoiceEmailGaveUp(coopId: number, invoiceId: number): Promise<void> {
  await Invoice.update(
    { emailStatus: 'failed' },
    { where: { id: invoiceId, coopId, emailStatus: ['queued', 'sending'] } },
  );
}

/**
 * Queues one mail job per invoice of the co-op whose e-mail is "queued" (after issuing, or after
 * "send now"). The worker sends them; a job for an invoice that is already sent does nothing, so
 * queuing twice is harmless.
 * @returns how many jobs were queued
 */
export async function sendQueuedInvoiceEmails(coopId: number): Promise<number> {
  const rows = await Invoice.findAll({
    where: { coopId, emailStatus: 'queued' },
    attributes: ['id'],
    order: [['number', 'ASC']],
    raw: true,
  });
  await enqueueInvoiceMails(
    coopId,
    rows.map((r) => r.id),
  );
  return rows.length;
}

/** Queues the month's unsent or failed e-mails again (treasurer's "send now"); returns how many. */
export async function resendMonthEmails(coopId: number, periodDate: string): Promise<number> {
  const [, rows] = await Invoice.update(
    { emailStatus: 'queued' },
    {
      where: { coopId, period: periodDate, status: { [Op.ne]: 'draft' }, emailStatus: ['not-sent', 'failed'] },
      returning: ['id'],
    },
  );
  // A web process that dies before this leaves them "queued": housekeeping queues their jobs.
  await enqueueInvoiceMails(
    coopId,
    rows.map((r) => r.id),
  );
  return rows.length;
}
