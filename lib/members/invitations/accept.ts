import 'server-only';
import { UniqueConstraintError, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { invitationAcceptedSchema } from '@/lib/api/dto/core';
import type { invitationInfoSchema } from '@/lib/api/dto/members';
import { audit } from '@/lib/audit';
import type { SessionUser } from '@/lib/auth';
import { emailIs } from '@/lib/auth/email';
import { hashPassword, isCommonPassword } from '@/lib/auth/passwords';
import { ROLE_SUMMARY } from '@/lib/auth/roles';
import { hashLinkToken, isLinkTokenShape } from '@/lib/auth/tokens';
import { inTransaction } from '@/lib/db';
import { conflict, forbidden, HttpError, notFound, invalidFields } from '@/lib/http';
import type { invitationAcceptSchema } from '@/lib/validation/auth';
import { Invitation, Membership, User } from '@/models';
import { INVITATION_ATTRIBUTES, INVITED_BY, isPast } from './columns';

// The invitee's side: the link in the e-mail. These take no Actor (the token is the credential);
// the signed-in user, if any, decides between "create an account" and "join with this account".

/** Who is opening the link, relative to the invited address. */
export type InviteeAccount = InvitationInfo['account'];

/** What an invitation link offers: the API's InvitationInfo. */
export type InvitationInfo = z.infer<typeof invitationInfoSchema>;

export type InvitationLookup =
  | { state: 'ok'; info: InvitationInfo }
  | { state: 'invalid' }
  | { state: 'revoked' | 'accepted' | 'expired'; coopName: string };

/** An invitation found by its link, with its co-op and inviter, and the account already using its address. */
interface TokenMatch {
  invitation: Invitation & { coop: NonNullable<Invitation['coop']> };
  existingUserId: number | null;
}

/**
 * The invitation behind a link. Inside a transaction the invitation row is locked (not the
 * co-op or the inviter), so a link is accepted exactly once.
 */
async function findByToken(token: string, transaction?: Transaction): Promise<TokenMatch | null> {
  if (!isLinkTokenShape(token)) return null;
  const invitation = await Invitation.findOne({
    attributes: [...INVITATION_ATTRIBUTES],
    where: { tokenHash: hashLinkToken(token) },
    include: [{ association: 'coop', attributes: ['name', 'slug', 'timezone'], required: true }, INVITED_BY],
    ...(transaction ? { transaction, lock: { level: transaction.LOCK.UPDATE, of: Invitation } } : {}),
  });
  if (!invitation?.coop) return null;
  const existing = await User.findOne({ attributes: ['id'], where: emailIs(invitation.email), transaction });
  return { invitation: invitation as TokenMatch['invitation'], existingUserId: existing?.id ?? null };
}

function stateOf(match: TokenMatch | null): InvitationLookup['state'] {
  if (!match) return 'invalid';
  const { status, expiresAt } = match.invitation;
  if (status !== 'pending') return status;
  return isPast(expiresAt) ? 'expired' : 'ok';
}

function accountOf(match: TokenMatch, user: SessionUser | null): InviteeAccount {
  if (!match.existingUserId) return 'new';
  if (!user) return 'sign-in-needed';
  return user.id === match.existingUserId ? 'signed-in' : 'other-account';
}

/** What the invitation page shows for a token (never throws for a bad link). */
export async function lookupInvitation(token: string, user: SessionUser | null): Promise<InvitationLookup> {
  const match = await findByToken(token);
  const state = stateOf(match);
  if (state === 'invalid' || !match) return { state: 'invalid' };
  const { invitation: inv } = match;
  if (state !== 'ok') return { state, coopName: inv.coop.name };
  return {
    state: 'ok',
    info: {
      coop: { name: inv.coop.name, slug: inv.coop.slug },
      role: inv.role,
      roleSummary: ROLE_SUMMARY[inv.role],
      email: inv.email,
      invitedBy: inv.invitedBy?.name ?? null,
      expiresAt: inv.expiresAt.toISOString(),
      account: accountOf(match, user),
      signedInAs: user?.email ?? null,
    },
  };
}

export const INVITATION_MESSAGES = {
  invalid:
    'This invitation link is not valid. Check that the whole link was copied from the e-mail, or ask the co-op’s admin for a new invitation.',
  revoked: 'This invitation was withdrawn by the co-op’s admin. Ask them for a new one if you still want to join.',
  accepted: 'This invitation has already been used. If that was you, sign in to reach the co-op.',
  expired: 'This invitation has expired. Ask the co-op’s admin to send it again; the new e-mail has a fresh link.',
} as const;

/** The lookup as an HTTP answer: 404 for an unknown link, 410 Gone for a used, withdrawn or expired one. */
export function invitationError(lookup: Exclude<InvitationLookup, { state: 'ok' }>): HttpError {
  if (lookup.state === 'invalid') return notFound(INVITATION_MESSAGES.invalid);
  return new HttpError(410, INVITATION_MESSAGES[lookup.state], undefined, {
    reason: lookup.state,
    coop: lookup.coopName,
  });
}

/**
 * Accepts an invitation: a new person gets an account (name + password of 12–128 characters,
 * not on the common list); a person who already has an account must be signed in as that
 * address. Either way they join the co-op with the invited role. The invitation row is locked,
 * so a link works exactly once.
 */
export async function acceptInvitation(
  token: string,
  user: SessionUser | null,
  input: z.infer<typeof invitationAcceptSchema>,
): Promise<z.infer<typeof invitationAcceptedSchema>> {
  // bcrypt takes a while: hash before taking the row lock (wasted only for existing accounts).
  const passwordHash = input.password !== undefined ? await hashPassword(input.password) : null;
  try {
    return await inTransaction(async (transaction) => {
      const match = await findByToken(token, transaction);
      const state = stateOf(match);
      if (!match || state === 'invalid') throw invitationError({ state: 'invalid' });
      const { invitation: inv, existingUserId } = match;
      if (state !== 'ok') throw invitationError({ state, coopName: inv.coop.name });

      let userId: number;
      const newAccount = !existingUserId;
      if (existingUserId) {
        if (!user) throw new HttpError(401, `An account already uses ${inv.email}. Sign in as ${inv.email} to accept.`);
        if (user.id !== existingUserId) {
          throw forbidden(
            `This invitation is for ${inv.email}, but you are signed in as ${user.email}. Sign out, then open the link again.`,
          );
        }
        userId = existingUserId;
      } else {
        const fields: Record<string, string[]> = {};
        if (!input.name) fields.name = ['Enter your name.'];
        if (!passwordHash) fields.password = ['Choose a password of 12 to 128 characters.'];
        else if (isCommonPassword(input.password!))
          fields.password = ['That password is on a list of commonly used passwords. Choose another.'];
        if (Object.keys(fields).length) throw invalidFields(fields);
        const created = await User.create(
          { email: inv.email.toLowerCase(), name: input.name!, passwordHash: passwordHash! },
          { transaction },
        );
        userId = created.id;
      }

      const already = await Membership.findOne({
        attributes: ['id'],
        where: { coopId: inv.coopId, userId },
        transaction,
      });
      if (already) throw conflict(`You are already a member of ${inv.coop.name}.`);
      const membership = await Membership.create({ coopId: inv.coopId, userId, role: inv.role }, { transaction });
      await inv.update({ status: 'accepted', acceptedAt: new Date() }, { transaction });
      await audit(
        {
          coopId: inv.coopId,
          actorUserId: userId,
          action: 'invitation.accept',
          entityType: 'invitation',
          entityId: inv.id,
          before: { email: inv.email, role: inv.role, status: 'pending' },
          after: { email: inv.email, role: inv.role, status: 'accepted', membershipId: membership.id, newAccount },
        },
        transaction,
      );
      await audit(
        {
          coopId: inv.coopId,
          actorUserId: userId,
          action: 'membership.create',
          entityType: 'membership',
          entityId: membership.id,
          before: null,
          after: { userId, email: inv.email, role: inv.role, status: 'active', invitationId: inv.id },
        },
        transaction,
      );
      return {
        coop: { slug: inv.coop.slug, name: inv.coop.name },
        role: inv.role,
        email: inv.email.toLowerCase(),
        newAccount,
      };
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) {
      // Two people (or two tabs) accepting at the same moment: the account or the membership was just made.
      if (/memberships/.test(e.parent?.message ?? '')) throw conflict('You are already a member of this co-op.');
      throw conflict(
        'An account with this e-mail address was created a moment ago. Sign in, then open the link again.',
      );
    }
    throw e;
  }
}
