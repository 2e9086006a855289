import 'server-only';
import type { Transaction } from 'sequelize';
import { formatExpiry } from '@/lib/account/format';
import { ROLE_SUMMARY, withArticle, type Role } from '@/lib/auth/roles';
import { derivedLinkToken, INVITATION_TTL_MS } from '@/lib/auth/tokens';
import { enqueueMailOnce, invitationMailKey, QUEUES, type InvitationMailJob } from '@/lib/jobs';
import { appUrl } from '@/lib/mail';
import { sendOnce } from '@/lib/mail/once';
import { Invitation } from '@/models';

/** The plain-text invitation e-mail. */
export function invitationMail(p: {
  coopName: string;
  inviter: string;
  role: Role;
  token: string;
  expiresAt: Date;
  timezone: string;
  name?: string | null;
}) {
  const link = appUrl(`/invite/${p.token}`);
  return {
    subject: `Invitation to join ${p.coopName} on Tallyvat`,
    text: [
      p.name ? `Hello ${p.name},` : 'Hello,',
      '',
      `${p.inviter} has invited you to join ${p.coopName} on Tallyvat as ${withArticle(p.role)}.`,
      `As ${withArticle(p.role)} you can ${ROLE_SUMMARY[p.role]}.`,
      '',
      'To accept, open this link:',
      '',
      `  ${link}`,
      '',
      `The link works once and expires on ${formatExpiry(p.expiresAt, p.timezone)}.`,
      'If you were not expecting this invitation you can ignore this e-mail: nothing happens unless the link is used.',
      '',
      '-- ',
      `Tallyvat for ${p.coopName}`,
    ].join('\n'),
  };
}

/**
 * Queues the e-mails of these invitations (already marked `queued`), one job each, inside the
 * caller's transaction: a job exists exactly when the invitation does. An invitation that
 * already has a live job (a resend clicked twice) gets no second one; `fresh` as in
 * enqueueMailOnce (an invitation put back to waiting from sent or not-sent).
 */
export async function enqueueInvitationMails(
  coopId: number,
  invitationIds: number[],
  transaction: Transaction,
  fresh = false,
): Promise<void> {
  await enqueueMailOnce<InvitationMailJob>(
    QUEUES.invitationMail,
    invitationIds.map((invitationId) => ({ coopId, invitationId })),
    invitationMailKey,
    transaction,
    fresh,
  );
}

type Sendable = Invitation & { coop: NonNullable<Invitation['coop']> };

/**
 * The worker's side: e-mails one queued invitation through the send ledger (lib/mail/once.ts),
 * like an invoice: ledger subject `invitation.<id>`, one generation per send on purpose (a
 * resend is the next one). The claim locks the invitation while it is still pending and
 * `queued`; the link's token is derived from the claimed Message-ID with the server's secret
 * (only its hash is stored), so a repeat after an ambiguous send carries the same link and
 * expiry. "sent" is committed right after the server's 250. SMTP trouble throws: the queue
 * tries again with back-off, and the dead letter marks it `not-sent`. A revoked or accepted
 * invitation, or one already sent, is not sent.
 * @param jobRef the job, `queue:id`
 * @returns whether this job sent the e-mail
 */
export async function deliverInvitationJob(coopId: number, invitationId: number, jobRef: string): Promise<boolean> {
  let inv: Sendable | null = null;
  const waiting = { id: invitationId, coopId, status: 'pending', delivery: 'queued' } as const;
  return sendOnce({
    subject: invitationMailKey({ invitationId }),
    coopId,
    jobRef,
    claim: async (transaction) => {
      inv = (await Invitation.findOne({
        attributes: ['id', 'email', 'name', 'role', 'tokenHash', 'expiresAt'],
        where: waiting,
        include: [
          { association: 'coop', attributes: ['name', 'timezone'], required: true },
          { association: 'invitedBy', attributes: ['name'] },
        ],
        lock: { level: transaction.LOCK.UPDATE, of: Invitation },
        transaction,
      })) as Sendable | null;
      return inv !== null;
    },
    mail: async ({ messageId }, transaction) => {
      const row = inv!;
      const { token, hash } = derivedLinkToken('invitation', messageId);
      let expiresAt = row.expiresAt;
      if (row.tokenHash !== hash) {
        // A new send: its link, valid from now. (The same Message-ID again: the link and expiry as they were.)
        expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
        await Invitation.update({ tokenHash: hash, expiresAt }, { where: { id: row.id, coopId }, transaction });
      }
      const mail = invitationMail({
        coopName: row.coop.name,
        inviter: row.invitedBy?.name ?? `The admin of ${row.coop.name}`,
        role: row.role,
        token,
        expiresAt,
        timezone: row.coop.timezone,
        name: row.name,
      });
      return { to: row.email, ...mail };
    },
    sent: (transaction) => Invitation.update({ delivery: 'sent' }, { where: waiting, transaction }),
  });
}

/** The dead letter of an invitation's mail job: every try failed; the admin can resend it. */
export async function invitationMailGaveUp(coopId: number, invitationId: number): Promise<void> {
  await Invitation.update({ delivery: 'not-sent' }, { where: { id: invitationId, coopId, delivery: 'queued' } });
}
