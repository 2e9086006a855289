import 'server-only';
import { fn, literal, type Transaction } from 'sequelize';
import { inTransaction } from '@/lib/db';
import { jobState } from '@/lib/jobs/queries';
import { log } from '@/lib/log';
import { MailSend } from '@/models';
import { deliverMail, type OutgoingMail } from './index';

/**
 * Sending one e-mail as close to exactly once as SMTP allows (docs/jobs.md). Each message has a
 * row in the send ledger (`mail_sends`), keyed by what it is (`subject`, e.g. `invoice.42`, and
 * the generation: the n-th time that subject is sent on purpose):
 *
 * 1. claim — one short transaction records the row "sending" with the job that holds it (and the
 *    caller's own mark, e.g. the invoice's "sending"), and commits *before* the message goes out;
 * 2. send, with the row's Message-ID;
 * 3. right after the server's 250, one short transaction marks the row (and the caller's record) sent.
 *
 * A job that finds the subject already sent does nothing. A worker killed between 1 and 3 leaves
 * the row "sending": that send is ambiguous (the server may have it). The job's retry, or another
 * job for the same subject once the holder is no longer running, logs it and sends again with the
 * same Message-ID, so the receiver can tell it is a repeat. SMTP refusing the message, or not
 * being reachable, is a send that surely did not happen: the claim is withdrawn and the job retried.
 */
export interface SendOnce {
  /** What the message is, e.g. `invoice.42` (the ledger key; at most 80 characters). */
  subject: string;
  coopId: number | null;
  /** The job sending it, `queue:id` (a retry keeps the id). */
  jobRef: string;
  /**
   * The message, or a function making it inside the claim's transaction from the claimed
   * Message-ID (an invitation derives its link from it, so a repeat carries the same link).
   */
  mail: OutgoingMail | ((claim: { messageId: string; generation: number }, t: Transaction) => Promise<OutgoingMail>);
  /** Marks the caller's record "sending" inside the claim; false when there is nothing to send any more. */
  claim?: (t: Transaction) => Promise<boolean>;
  /** Marks the caller's record sent, in the transaction that marks the ledger row. */
  sent?: (t: Transaction) => Promise<unknown>;
  /** Puts the caller's record back to waiting after a send that surely did not happen. */
  unsent?: (t: Transaction) => Promise<unknown>;
}

/** Another job holds the subject's in-flight claim and is still running: try again later. */
export class MailInFlightElsewhere extends Error {}

type Claim = { generation: number; messageId: string; fresh: boolean; mail: OutgoingMail };

/** The domain Message-IDs are made in: the sender's. */
function messageDomain(): string {
  const from = process.env.MAIL_FROM ?? 'no-reply@tallyvat.localhost';
  return from.match(/@([^>\s]+)/)?.[1] ?? 'tallyvat.localhost';
}

/** `<invoice.42.g1.mbx3k2@tallyvat.localhost>`: the subject, its generation and when that generation began. */
function makeMessageId(subject: string, generation: number): string {
  return `<${subject}.g${generation}.${Date.now().toString(36)}@${messageDomain()}>`;
}

/**
 * True when a nodemailer error means the server never took the message: it answered with a
 * refusal, or the connection was never made. A socket cut or timeout after the message body was
 * written is not such a case (the server may have accepted it).
 */
export function surelyNotSent(e: unknown): boolean {
  const err = e as { code?: string; command?: string; responseCode?: number };
  if (typeof err?.responseCode === 'number' && err.responseCode >= 400) return true;
  return (
    err?.command === 'CONN' || ['ECONNECTION', 'EDNS', 'EAUTH', 'EENVELOPE', 'ECONNREFUSED'].includes(err?.code ?? '')
  );
}

async function claimSend(o: SendOnce): Promise<Claim | null> {
  const compose = (c: Omit<Claim, 'mail'>, t: Transaction) => (typeof o.mail === 'function' ? o.mail(c, t) : o.mail);
  return inTransaction(async (transaction) => {
    if (o.claim && !(await o.claim(transaction))) return null;
    const where = { subject: o.subject, ...(o.coopId !== null ? { coopId: o.coopId } : {}) };
    const last = await MailSend.findOne({
      where,
      order: [['generation', 'DESC']],
      attributes: ['generation', 'messageId', 'state', 'claimedBy'],
      raw: true,
      transaction,
    });
    if (last?.state === 'sending') {
      if (last.claimedBy !== o.jobRef) {
        const holder = await jobState(last.claimedBy);
        if (holder === 'active') throw new MailInFlightElsewhere(`${o.subject} is being sent by ${last.claimedBy}`);
        // The holder will run again itself: leave it to it.
        if (holder === 'created' || holder === 'retry') return null;
      }
      await MailSend.update(
        { claimedBy: o.jobRef, tries: literal('tries + 1'), claimedAt: fn('now') },
        { where: { subject: o.subject, generation: last.generation }, transaction },
      );
      log.warn(
        { event: 'mail.ambiguous', subject: o.subject, messageId: last.messageId, previousClaim: last.claimedBy },
        'an earlier send may have been delivered; sending again with the same Message-ID',
      );
      const again = { generation: last.generation, messageId: last.messageId, fresh: false };
      return { ...again, mail: await compose(again, transaction) };
    }
    const generation = (last?.generation ?? 0) + 1;
    const messageId = makeMessageId(o.subject, generation);
    await MailSend.create(
      { subject: o.subject, generation, coopId: o.coopId, messageId, state: 'sending', claimedBy: o.jobRef },
      { transaction },
    );
    const claim = { generation, messageId, fresh: true };
    return { ...claim, mail: await compose(claim, transaction) };
  });
}

/** Runs `f` until it succeeds, for about half a minute (the database may be briefly away). */
async function persistently<T>(f: () => Promise<T>): Promise<T> {
  for (let i = 0; ; i++) {
    try {
      return await f();
    } catch (e) {
      if (i >= 10) throw e;
      await new Promise((r) => setTimeout(r, Math.min(500 * 2 ** i, 5_000)));
    }
  }
}

/**
 * Sends one message at most once per claim (see above). Throws on SMTP trouble (the job is
 * retried with back-off) and when another running job holds the claim.
 * @returns whether this call handed the message to the server
 */
export async function sendOnce(o: SendOnce): Promise<boolean> {
  const claim = await claimSend(o);
  if (!claim) return false;
  const key = { subject: o.subject, generation: claim.generation };
  try {
    await deliverMail({ ...claim.mail, messageId: claim.messageId });
  } catch (e) {
    // A fresh claim that surely never reached the server is withdrawn; an ambiguous one stays.
    if (claim.fresh && surelyNotSent(e)) {
      await inTransaction(async (transaction) => {
        await MailSend.destroy({ where: { ...key, state: 'sending', claimedBy: o.jobRef }, transaction });
        await o.unsent?.(transaction);
      });
    }
    throw e;
  }
  // The server has it: record that now, and keep trying for a while if the database is away
  // (giving up here would make the retry send it again).
  await persistently(() =>
    inTransaction(async (transaction) => {
      await MailSend.update({ state: 'sent', sentAt: fn('now') }, { where: { ...key, state: 'sending' }, transaction });
      await o.sent?.(transaction);
    }),
  );
  return true;
}
