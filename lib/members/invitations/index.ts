import 'server-only';
import type { invitationSchema, revokedSchema } from '@/lib/api/dto/members';
import { Op, UniqueConstraintError, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { emailIs } from '@/lib/auth/email';
import { INVITATION_TTL_MS, newLinkToken } from '@/lib/auth/tokens';
import { inTransaction } from '@/lib/db';
import { conflict, notFound } from '@/lib/http';
import { enqueueInvitationMails } from './deliver';
import type { invitationCreateSchema } from '@/lib/validation/auth';
import { invitationMailKey } from '@/lib/jobs';
import { Invitation, MailSend, Membership } from '@/models';
import type { InvitationDelivery } from '@/models/Invitation';

export type { InvitationDelivery };
export {
  lookupInvitation,
  acceptInvitation,
  invitationError,
  INVITATION_MESSAGES,
  type InvitationInfo,
  type InvitationLookup,
  type InviteeAccount,
} from './accept';

/** A pending invitation as the members screen lists it. */
export type InvitationDto = z.infer<typeof invitationSchema>;

import { INVITATION_ATTRIBUTES, INVITED_BY, isPast } from './columns';

const toDto = (i: Invitation, sentAt: Map<number, Date>): InvitationDto => ({
  id: i.id,
  email: i.email,
  role: i.role,
  delivery: i.delivery,
  sentAt: sentAt.get(i.id)?.toISOString() ?? null,
  expiresAt: i.expiresAt.toISOString(),
  createdAt: i.createdAt.toISOString(),
  invitedBy: i.invitedBy?.name ?? null,
  expired: isPast(i.expiresAt),
});

/** Pending invitations of the co-op (expired ones too, so they can be resent), newest first. */
export async function listPendingInvitations(actor: Actor): Promise<InvitationDto[]> {
  const rows = await Invitation.findAll({
    attributes: [...INVITATION_ATTRIBUTES],
    where: { coopId: actor.coop.id, status: 'pending' },
    include: [INVITED_BY],
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  const sent = await lastSentAt(
    actor.coop.id,
    rows.map((r) => r.id),
  );
  return rows.map((r) => toDto(r, sent));
}

/** When each invitation's e-mail was last taken by the mail server, from the send ledger. */
async function lastSentAt(coopId: number, ids: number[]): Promise<Map<number, Date>> {
  if (ids.length === 0) return new Map();
  const rows = await MailSend.findAll({
    attributes: ['subject', 'sentAt'],
    where: { coopId, subject: ids.map((invitationId) => invitationMailKey({ invitationId })), state: 'sent' },
    order: [['generation', 'ASC']],
    raw: true,
  });
  return new Map(rows.map((r) => [Number(r.subject.slice('invitation.'.length)), r.sentAt!]));
}

/** The invitation (id AND co-op in one query) locked for the rest of the transaction, or a 404. */
async function lockInvitation(actor: Actor, id: number, transaction: Transaction): Promise<Invitation> {
  const row = await Invitation.findOne({
    attributes: [...INVITATION_ATTRIBUTES],
    where: { id, coopId: actor.coop.id },
    lock: transaction.LOCK.UPDATE,
    transaction,
  });
  if (!row) throw notFound('That invitation is not in this co-op.');
  return row;
}

async function reloadDto(actor: Actor, id: number): Promise<InvitationDto> {
  const row = await Invitation.findOne({
    attributes: [...INVITATION_ATTRIBUTES],
    where: { id, coopId: actor.coop.id },
    include: [INVITED_BY],
  });
  if (!row) throw notFound('That invitation is not in this co-op.');
  return toDto(row, await lastSentAt(actor.coop.id, [id]));
}

/**
 * Invites a person by e-mail with a role: the invitation is saved `queued` and its e-mail job is
 * written in the same transaction (the worker makes the link and sends it, exactly once; see
 * deliver.ts). Until then the row holds a placeholder hash nobody has the token of. 409 when the
 * address already belongs to a member or has a pending, unexpired invitation (an expired one is
 * renewed in place).
 */
export async function createInvitation(
  actor: Actor,
  input: z.infer<typeof invitationCreateSchema>,
): Promise<{ invitation: InvitationDto; queued: true }> {
  const { hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  let id: number;
  try {
    id = await inTransaction(async (transaction) => {
      const member = await Membership.findOne({
        attributes: ['id'],
        where: { coopId: actor.coop.id },
        include: [{ association: 'user', attributes: [], required: true, where: emailIs(input.email, 'user.email') }],
        transaction,
      });
      if (member) throw conflict(`${input.email} is already a member of this co-op.`);
      const pending = await Invitation.findOne({
        attributes: [...INVITATION_ATTRIBUTES],
        where: { coopId: actor.coop.id, status: 'pending', [Op.and]: [emailIs(input.email)] },
        lock: transaction.LOCK.UPDATE,
        transaction,
      });
      if (pending && !isPast(pending.expiresAt)) {
        throw conflict(
          `An invitation to ${input.email} is already waiting to be accepted. Resend it or revoke it from the list of invitations.`,
          {
            invitationId: pending.id,
          },
        );
      }
      if (pending) {
        // The old link has expired: renew the same invitation with a new link and the chosen role.
        const before = { email: pending.email, role: pending.role, expiresAt: pending.expiresAt.toISOString() };
        await pending.update(
          { role: input.role, tokenHash: hash, expiresAt, delivery: 'queued', invitedByUserId: actor.user.id },
          { transaction },
        );
        await audit(
          {
            coopId: actor.coop.id,
            actorUserId: actor.user.id,
            action: 'invitation.renew',
            entityType: 'invitation',
            entityId: pending.id,
            before,
            after: { email: pending.email, role: input.role, expiresAt: expiresAt.toISOString() },
          },
          transaction,
        );
        await enqueueInvitationMails(actor.coop.id, [pending.id], transaction, true);
        return pending.id;
      }
      const created = await Invitation.create(
        {
          coopId: actor.coop.id,
          email: input.email,
          role: input.role,
          tokenHash: hash,
          delivery: 'queued',
          invitedByUserId: actor.user.id,
          expiresAt,
          acceptedAt: null,
        },
        { transaction },
      );
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'invitation.create',
          entityType: 'invitation',
          entityId: created.id,
          before: null,
          after: { email: input.email, role: input.role, expiresAt: expiresAt.toISOString() },
        },
        transaction,
      );
      await enqueueInvitationMails(actor.coop.id, [created.id], transaction, true);
      return created.id;
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError)
      throw conflict(`An invitation to ${input.email} was just created. Refresh the list.`);
    throw e;
  }
  return { invitation: await reloadDto(actor, id), queued: true };
}

/**
 * Sends a pending invitation again with a NEW link (the old one stops working at once) valid for
 * 7 more days from sending. Used after "not-sent" or when the person lost the e-mail. The e-mail
 * goes through the job queue like every invitation.
 */
export async function resendInvitation(actor: Actor, id: number): Promise<{ invitation: InvitationDto; queued: true }> {
  const { hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  await inTransaction(async (transaction) => {
    const inv = await lockInvitation(actor, id, transaction);
    if (inv.status !== 'pending') throw conflict(`This invitation was already ${inv.status}; it cannot be resent.`);
    const before = { delivery: inv.delivery, expiresAt: inv.expiresAt.toISOString() };
    await inv.update({ tokenHash: hash, expiresAt, delivery: 'queued' }, { transaction });
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'invitation.resend',
        entityType: 'invitation',
        entityId: id,
        before,
        after: { delivery: 'queued', expiresAt: expiresAt.toISOString(), newLink: true },
      },
      transaction,
    );
    await enqueueInvitationMails(actor.coop.id, [id], transaction, before.delivery !== 'queued');
  });
  return { invitation: await reloadDto(actor, id), queued: true };
}

/** Withdraws a pending invitation; its link then says so. */
export async function revokeInvitation(actor: Actor, id: number): Promise<z.infer<typeof revokedSchema>> {
  return inTransaction(async (transaction) => {
    const inv = await lockInvitation(actor, id, transaction);
    if (inv.status !== 'pending') throw conflict(`This invitation was already ${inv.status}.`);
    await inv.update({ status: 'revoked' }, { transaction });
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'invitation.revoke',
        entityType: 'invitation',
        entityId: id,
        before: { email: inv.email, role: inv.role, status: 'pending' },
        after: { email: inv.email, role: inv.role, status: 'revoked' },
      },
      transaction,
    );
    return { revoked: true as const, id };
  });
}
