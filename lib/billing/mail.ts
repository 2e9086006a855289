import 'server-only';
import { literal, Op } from 'sequelize';
import { inTransaction } from '@/lib/db';
import { appUrl, sendMail } from '@/lib/mail';
import { formatCents } from '@/lib/money';
import { Coop, Invoice } from '@/models';
import { getInvoiceDetail } from './invoices';
import { invoiceFileName, renderInvoicePdf, type PdfCoop } from './pdf';
import { formatDateIn, periodLabel } from './periods';
import type { EmailStatus } from './types';

async function loadCoop(coopId: number): Promise<PdfCoop> {
  const c = await Coop.findByPk(coopId, { attributes: ['name', 'slug', 'units', 'currency', 'timezone'], raw: true });
  return c!;
}

/** One more sending attempt, counted in the database (concurrent senders never lose one). */
const ATTEMPT = literal('email_attempts + 1');

/**
 * Claims up to ten queued e-mails of a co-op (queued → sending, FOR UPDATE SKIP LOCKED), so two
 * senders never mail the same invoice; a claim left "sending" by a crashed server is taken again
 * after five minutes.
 */
async function claimBatch(coopId: number): Promise<{ id: number }[]> {
  return inTransaction(async (t) => {
    const batch = await Invoice.findAll({
      where: {
        coopId,
        [Op.or]: [{ emailStatus: 'queued' }, { emailStatus: 'sending', updatedAt: { [Op.lt]: literal("now() - interval '5 minutes'") } }],
      },
      attributes: ['id'],
      order: [['number', 'ASC']],
      limit: 10,
      lock: t.LOCK.UPDATE,
      skipLocked: true,
      raw: true,
      transaction: t,
    });
    if (batch.length > 0) await Invoice.update({ emailStatus: 'sending' }, { where: { id: batch.map((b) => b.id), coopId }, transaction: t });
    return batch;
  });
}

/**
 * E-mails one issued invoice or credit note to its member with the PDF attached, and records the
 * outcome on the invoice (sent / failed, attempts, time). Never throws for mail trouble.
 */
export async function sendInvoiceEmail(coopId: number, invoiceId: number, coop?: PdfCoop): Promise<EmailStatus> {
  const c = coop ?? (await loadCoop(coopId));
  const inv = await getInvoiceDetail(coopId, invoiceId, { includeDrafts: false });
  const pdf = await renderInvoicePdf(inv, c);
  const isCredit = inv.kind === 'credit-note';
  const money = (n: number) => formatCents(n, c.currency);
  const first = inv.memberName.split(/\s+/)[0] || inv.memberName;
  const text = isCredit
    ? `Hello ${first},\n\n${c.name} has cancelled invoice ${inv.original?.label ?? ''} for ${periodLabel(inv.period)}. The credit note ${inv.label} is attached.\nAnything you had paid on that invoice is held as credit on your account and taken off your next invoice.\n\nYour invoices: ${appUrl(`/c/${c.slug}/invoices`)}\n\n— ${c.name} (sent by Tallyvat)\n`
    : `Hello ${first},\n\nYour invoice ${inv.label} for ${periodLabel(inv.period)} from ${c.name} is attached.\nTotal: ${money(inv.totalCents)}. Amount due: ${money(inv.outstandingCents)}${inv.dueOn && inv.outstandingCents > 0 ? `, by ${formatDateIn(inv.dueOn, c.timezone)}` : ''}.\n\nPay by card or see all your invoices: ${appUrl(`/c/${c.slug}/invoices/${inv.id}`)}\nOr pay the treasurer in cash or by cheque, writing ${inv.label} on it.\n\n— ${c.name} (sent by Tallyvat)\n`;
  const ok = await sendMail({
    to: inv.memberEmail,
    subject: `${c.name}: ${isCredit ? 'credit note' : 'invoice'} ${inv.label} for ${periodLabel(inv.period)}`,
    text,
    attachments: [{ filename: invoiceFileName(c.slug, inv), content: pdf, contentType: 'application/pdf' }],
  });
  const status: EmailStatus = ok ? 'sent' : 'failed';
  await Invoice.update({ emailStatus: status, emailAttempts: ATTEMPT, ...(ok ? { emailedAt: new Date() } : {}) }, { where: { id: invoiceId, coopId } });
  return status;
}

/**
 * Sends every queued invoice e-mail of a co-op, a few at a time. Each batch is claimed atomically
 * (queued → sending, SKIP LOCKED), so two senders never mail the same invoice; a batch left
 * "sending" by a crashed server is picked up again after five minutes.
 */
export async function sendQueuedInvoiceEmails(coopId: number): Promise<{ sent: number; failed: number }> {
  const coop = await loadCoop(coopId);
  let sent = 0;
  let failed = 0;
  for (;;) {
    const batch = await claimBatch(coopId);
    if (batch.length === 0) break;
    for (const { id } of batch) {
      try {
        if ((await sendInvoiceEmail(coopId, id, coop)) === 'sent') sent++;
        else failed++;
      } catch (e) {
        console.error(`[billing] e-mail for invoice ${id} failed:`, e);
        await Invoice.update({ emailStatus: 'failed', emailAttempts: ATTEMPT }, { where: { id, coopId } });
        failed++;
      }
    }
  }
  return { sent, failed };
}

/** Queues the month's unsent or failed e-mails again (treasurer's "send now"). */
export async function requeueEmails(coopId: number, periodDate: string): Promise<number> {
  const [n] = await Invoice.update(
    { emailStatus: 'queued' },
    { where: { coopId, period: periodDate, status: { [Op.ne]: 'draft' }, emailStatus: ['not-sent', 'failed'] } },
  );
  return n;
}
