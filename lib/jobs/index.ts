import 'server-only';
import type { Transaction } from 'sequelize';
import { webBoss } from './boss';
import { QUEUES, type InvitationMailJob, type InvoiceMailJob, type MailRecord, type PlainMailJob, type RunChunkJob } from './names';
import { transactionDb } from './queries';

export { QUEUES };
export type { InvitationMailJob, InvoiceMailJob, MailRecord, PlainMailJob, RunChunkJob };

/**
 * Queues one job. With a transaction, the job is written by that transaction (it exists exactly
 * when the transaction commits); without, it is written at once.
 */
export async function enqueue<T extends object>(name: string, data: T, o: { transaction?: Transaction; startAfter?: number | Date } = {}): Promise<void> {
  const boss = await webBoss();
  await boss.send(name, data, { ...(o.transaction ? { db: transactionDb(o.transaction) } : {}), ...(o.startAfter !== undefined ? { startAfter: o.startAfter } : {}) });
}

/** Queues many jobs of one queue in one statement. */
export async function enqueueMany<T extends object>(name: string, data: T[], o: { transaction?: Transaction } = {}): Promise<void> {
  if (data.length === 0) return;
  const boss = await webBoss();
  for (let i = 0; i < data.length; i += 1000) {
    await boss.insert(name, data.slice(i, i + 1000).map((d) => ({ data: d })), o.transaction ? { db: transactionDb(o.transaction) } : undefined);
  }
}

/** Queues a plain e-mail (one job, retried with back-off; see lib/jobs/boss.ts). */
export function enqueueMail(mail: { to: string; subject: string; text: string }, record: MailRecord = { kind: 'none' }, transaction?: Transaction): Promise<void> {
  return enqueue<PlainMailJob>(QUEUES.mail, { ...mail, record }, { transaction });
}

/** Queues the e-mails of these issued invoices or credit notes, one job each. */
export function enqueueInvoiceMails(coopId: number, invoiceIds: number[], transaction?: Transaction): Promise<void> {
  return enqueueMany<InvoiceMailJob>(QUEUES.invoiceMail, invoiceIds.map((invoiceId) => ({ coopId, invoiceId })), { transaction });
}
