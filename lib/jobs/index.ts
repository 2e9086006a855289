import 'server-only';
import type { Transaction } from 'sequelize';
import { webBoss } from './boss';
import {
  QUEUES,
  type InvitationMailJob,
  type InvoiceMailJob,
  type MailRecord,
  type PlainMailJob,
  type RunChunkJob,
} from './names';
import { liveJobKeys, transactionDb } from './queries';

export { QUEUES };
export type { InvitationMailJob, InvoiceMailJob, MailRecord, PlainMailJob, RunChunkJob };

/**
 * Queues one job. With a transaction, the job is written by that transaction (it exists exactly
 * when the transaction commits); without, it is written at once. `singletonKey` names what the
 * job is about (a message's ledger subject), so producers can see whether one is already live.
 */
export async function enqueue<T extends object>(
  name: string,
  data: T,
  o: { transaction?: Transaction; startAfter?: number | Date; singletonKey?: string } = {},
): Promise<void> {
  const boss = await webBoss();
  await boss.send(name, data, {
    ...(o.transaction ? { db: transactionDb(o.transaction) } : {}),
    ...(o.startAfter !== undefined ? { startAfter: o.startAfter } : {}),
    ...(o.singletonKey ? { singletonKey: o.singletonKey } : {}),
  });
}

/** Queues many jobs of one queue in one statement; `key` gives each its singleton key. */
export async function enqueueMany<T extends object>(
  name: string,
  data: T[],
  o: { transaction?: Transaction; key?: (d: T) => string } = {},
): Promise<void> {
  if (data.length === 0) return;
  const boss = await webBoss();
  for (let i = 0; i < data.length; i += 1000) {
    const jobs = data.slice(i, i + 1000).map((d) => ({ data: d, ...(o.key ? { singletonKey: o.key(d) } : {}) }));
    await boss.insert(name, jobs, o.transaction ? { db: transactionDb(o.transaction) } : undefined);
  }
}

/**
 * Queues one mail job per message unless that message already has a live job (waiting, retrying
 * or running): a message has at most one live job. Keys are the messages' ledger subjects.
 * Two producers racing for the same message may still both queue one; the send ledger
 * (lib/mail/once.ts) then sends it once and the second job does nothing. `fresh`: the message
 * was just put back to waiting from sent or failed, so a running job for it is finishing an
 * earlier send and does not count.
 * @returns how many jobs were queued
 */
export async function enqueueMailOnce<T extends object>(
  queue: string,
  data: T[],
  key: (d: T) => string,
  transaction?: Transaction,
  fresh = false,
): Promise<number> {
  let queued = 0;
  for (let i = 0; i < data.length; i += 1000) {
    const slice = data.slice(i, i + 1000);
    const live = await liveJobKeys(queue, slice.map(key), transaction, fresh);
    const todo = slice.filter((d) => !live.has(key(d)));
    await enqueueMany(queue, todo, { transaction, key });
    queued += todo.length;
  }
  return queued;
}

/** The ledger subject (and job singleton key) of an invoice's e-mail. */
export const invoiceMailKey = (d: { invoiceId: number }) => `invoice.${d.invoiceId}`;
/** The ledger subject (and job singleton key) of an invitation's e-mail. */
export const invitationMailKey = (d: { invitationId: number }) => `invitation.${d.invitationId}`;

/** Queues a plain e-mail (one job, retried with back-off; see lib/jobs/boss.ts). */
export function enqueueMail(
  mail: { to: string; subject: string; text: string },
  record: MailRecord = { kind: 'none' },
  transaction?: Transaction,
): Promise<void> {
  return enqueue<PlainMailJob>(
    QUEUES.mail,
    { ...mail, record },
    {
      transaction,
      ...(record.kind === 'email-change' ? { singletonKey: emailChangeMailKey(record.authTokenId) } : {}),
    },
  );
}

/** The ledger subject (and job singleton key) of an e-mail-change confirmation. */
export const emailChangeMailKey = (authTokenId: number) => `email-change.${authTokenId}`;

/**
 * Queues the e-mails of these issued invoices or credit notes, one job each, skipping any that
 * already has a live job (see enqueueMailOnce for `fresh`).
 * @returns how many jobs were queued
 */
export function enqueueInvoiceMails(
  coopId: number,
  invoiceIds: number[],
  transaction?: Transaction,
  fresh = false,
): Promise<number> {
  return enqueueMailOnce<InvoiceMailJob>(
    QUEUES.invoiceMail,
    invoiceIds.map((invoiceId) => ({ coopId, invoiceId })),
    invoiceMailKey,
    transaction,
    fresh,
  );
}
