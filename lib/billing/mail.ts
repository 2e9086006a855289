import 'server-only';
import { appUrl, sendMail } from '@/lib/mail';
import { formatCents } from '@/lib/money';
import { exec, select } from './db';
import { getInvoiceDetail } from './invoices';
import { invoiceFileName, renderInvoicePdf, type PdfCoop } from './pdf';
import { formatDateIn, periodLabel } from './periods';
import type { EmailStatus } from './types';

async function loadCoop(coopId: number): Promise<PdfCoop> {
  const [c] = await select<PdfCoop>('SELECT name, slug, units, currency, timezone FROM coops WHERE id = $id', { id: coopId });
  return c!;
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
  await exec(
    `UPDATE invoices SET email_status = $status, email_attempts = email_attempts + 1, emailed_at = CASE WHEN $status::varchar = 'sent' THEN now() ELSE emailed_at END, updated_at = now()
     WHERE id = $id AND coop_id = $coopId`,
    { status, id: invoiceId, coopId },
  );
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
    const batch = await select<{ id: number }>(
      `UPDATE invoices SET email_status = 'sending', updated_at = now()
       WHERE id IN (SELECT id FROM invoices WHERE coop_id = $coopId
                      AND (email_status = 'queued' OR (email_status = 'sending' AND updated_at < now() - interval '5 minutes'))
                    ORDER BY number LIMIT 10 FOR UPDATE SKIP LOCKED)
       RETURNING id`,
      { coopId },
    );
    if (batch.length === 0) break;
    for (const { id } of batch) {
      try {
        if ((await sendInvoiceEmail(coopId, id, coop)) === 'sent') sent++;
        else failed++;
      } catch (e) {
        console.error(`[billing] e-mail for invoice ${id} failed:`, e);
        await exec(`UPDATE invoices SET email_status = 'failed', email_attempts = email_attempts + 1, updated_at = now() WHERE id = $id`, { id });
        failed++;
      }
    }
  }
  return { sent, failed };
}

/** Queues the month's unsent or failed e-mails again (treasurer's "send now"). */
export async function requeueEmails(coopId: number, periodDate: string): Promise<number> {
  return exec(
    `UPDATE invoices SET email_status = 'queued', updated_at = now()
     WHERE coop_id = $coopId AND period = $period::date AND status <> 'draft' AND email_status IN ('not-sent','failed')`,
    { coopId, period: periodDate },
  );
}
