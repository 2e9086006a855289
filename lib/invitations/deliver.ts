import 'server-only';
import type { Transaction } from 'sequelize';
import { formatExpiry } from '@/lib/account/format';
import { ROLE_SUMMARY, withArticle, type Role } from '@/lib/auth/roles';
import { INVITATION_TTL_MS, newLinkToken } from '@/lib/auth/tokens';
import { inTransaction } from '@/lib/db';
import { enqueueMany, QUEUES, type InvitationMailJob } from '@/lib/jobs';
import { appUrl, deliverMail } from '@/lib/mail';
import { Invitation } from '@/models';

/** The plain-text invitation e-mail. */
export function invitationMail(p: { coopName: string; inviter: string; role: Role; token: string; expiresAt: Date; timezone: string; name?: string | null }) {
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
 * caller's transaction: a job exists exactly when the invitation does.
 */
export function enqueueInvitationMails(coopId: number, invitationIds: number[], transaction: Transaction): Promise<void> {
  return enqueueMany<InvitationMailJob>(QUEUES.invitationMail, invitationIds.map((invitationId) => ({ coopId, invitationId })), { transaction });
}

/**
 * The worker's side: e-mails one queued invitation, exactly once. The link's token is made here,
 * so it is never stored anywhere but in the e-mail (only its SHA-256 is kept). One transaction
 * locks the row while it is still `queued`, pending and unexpired, records the new link and
 * `sent`, hands the message to SMTP and commits only after the server accepted it: a second job
 * for the same invitation finds it no longer queued; a failed send rolls back to `queued` and
 * the job is retried. The one window left for a second copy is between SMTP's "250 OK" and the
 * COMMIT. A revoked or accepted invitation is not sent.
 * @returns whether an e-mail was sent
 */
export async function deliverInvitationJob(coopId: number, invitationId: number): Promise<boolean> {
  return inTransaction(async (transaction) => {
    const inv = await Invitation.findOne({
      attributes: ['id', 'email', 'name', 'role', 'status', 'delivery'],
      where: { id: invitationId, coopId, status: 'pending', delivery: 'queued' },
      include: [
        { association: 'coop', attributes: ['name', 'timezone'], required: true },
        { association: 'invitedBy', attributes: ['name'] },
      ],
      lock: { level: transaction.LOCK.UPDATE, of: Invitation },
      transaction,
    });
    if (!inv?.coop) return false;
    const { token, hash } = newLinkToken();
    const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
    await Invitation.update({ tokenHash: hash, expiresAt, delivery: 'sent' }, { where: { id: inv.id, coopId }, transaction });
    const mail = invitationMail({
      coopName: inv.coop.name, inviter: inv.invitedBy?.name ?? `The admin of ${inv.coop.name}`, role: inv.role, token, expiresAt,
      timezone: inv.coop.timezone, name: inv.name,
    });
    await deliverMail({ to: inv.email, ...mail });
    return true;
  });
}

/** The dead letter of an invitation's mail job: every try failed; the admin can resend it. */
export async function invitationMailGaveUp(coopId: number, invitationId: number): Promise<void> {
  await Invitation.update({ delivery: 'not-sent' }, { where: { id: invitationId, coopId, delivery: 'queued' } });
}
