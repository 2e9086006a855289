/** Queue names and the data each job carries. One file, so producers and the worker agree. */

export const QUEUES = {
  /** One e-mail per job: an invoice or credit note with its PDF. */
  invoiceMail: 'mail-invoice',
  /** One invitation e-mail per job (the link is made when it is sent). */
  invitationMail: 'mail-invitation',
  /** One plain e-mail per job (password reset, e-mail change, low-stock alert). */
  mail: 'mail',
  /** Mail jobs that used up their tries end here (dead letter) and are recorded as failed. */
  mailDead: 'mail-dead',
  /** One chunk of a billing run; each chunk queues the next in its own transaction. */
  runChunk: 'billing-run-chunk',
  /** Chunks that used up their tries: the run is marked failed. */
  runDead: 'billing-run-dead',
  /** Scheduled: lapsed reservations of every co-op marked expired. */
  expireReservations: 'expire-reservations',
  /** Scheduled: card payments whose outcome is unknown looked up at the provider. */
  settlePayments: 'settle-payments',
  /** Scheduled: old sign-in attempts, used/expired links, and invoices queued but never enqueued. */
  housekeeping: 'housekeeping',
} as const;

export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

export interface InvitationMailJob {
  coopId: number;
  invitationId: number;
}

export interface InvoiceMailJob {
  coopId: number;
  invoiceId: number;
}

/**
 * What a plain e-mail is, when something shows its delivery: an e-mail-change confirmation is
 * its own ledger subject (`email-change.<auth token id>`), so the profile can show how it went.
 */
export type MailRecord = { kind: 'none' } | { kind: 'email-change'; authTokenId: number };

export interface PlainMailJob {
  to: string;
  subject: string;
  text: string;
  record: MailRecord;
}

export interface RunChunkJob {
  coopId: number;
  runId: number;
  /** The last membership id of the previous chunk (0 for the first). */
  afterId: number;
  /** The run's doneMembers before this chunk: a replayed chunk sees a different value and stops. */
  done: number;
}
