import 'server-only';
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor, SessionUser } from '@/lib/auth';
import { hashPassword, isCommonPassword } from '@/lib/auth/passwords';
import { ROLE_SUMMARY, withArticle, type Role } from '@/lib/auth/roles';
import { hashLinkToken, INVITATION_TTL_MS, isLinkTokenShape, newLinkToken } from '@/lib/auth/tokens';
import { conflict, forbidden, HttpError, notFound } from '@/lib/http';
import { appUrl, sendMail } from '@/lib/mail';
import { formatExpiry } from '@/lib/account/format';
import type { invitationAcceptSchema, invitationCreateSchema } from '@/lib/validation/auth';
import { sequelize } from '@/models';

export type InvitationDelivery = 'sent' | 'not-sent';

/** A pending invitation as the members screen lists it. */
export interface InvitationDto {
  id: number;
  email: string;
  role: Role;
  delivery: InvitationDelivery;
  expiresAt: string;
  createdAt: string;
  invitedBy: string | null;
  /** Past its expiry: the link no longer works; resending makes a new one. */
  expired: boolean;
}

type InvitationRow = {
  id: number; coop_id: number; email: string; role: Role; status: 'pending' | 'accepted' | 'revoked'; delivery: InvitationDelivery;
  expires_at: Date | string; created_at: Date | string; invited_by: string | null;
};

const toDto = (r: InvitationRow): InvitationDto => ({
  id: r.id,
  email: r.email,
  role: r.role,
  delivery: r.delivery,
  expiresAt: new Date(r.expires_at).toISOString(),
  createdAt: new Date(r.created_at).toISOString(),
  invitedBy: r.invited_by,
  expired: new Date(r.expires_at).getTime() <= Date.now(),
});

const SELECT_INVITATION = `
  SELECT i.id, i.coop_id, i.email, i.role, i.status, i.delivery, i.expires_at, i.created_at, u.name AS invited_by
  FROM invitations i LEFT JOIN users u ON u.id = i.invited_by_user_id`;

/** Pending invitations of the co-op (expired ones too, so they can be resent), newest first. */
export async function listPendingInvitations(actor: Actor): Promise<InvitationDto[]> {
  const rows = await sequelize.query<InvitationRow>(`${SELECT_INVITATION} WHERE i.coop_id = :coopId AND i.status = 'pending' ORDER BY i.created_at DESC, i.id DESC`, {
    replacements: { coopId: actor.coop.id },
    type: QueryTypes.SELECT,
  });
  return rows.map(toDto);
}

async function findInvitation(actor: Actor, id: number, transaction: Transaction): Promise<InvitationRow> {
  const [row] = await sequelize.query<InvitationRow>(`${SELECT_INVITATION} WHERE i.id = :id AND i.coop_id = :coopId FOR UPDATE OF i`, {
    replacements: { id, coopId: actor.coop.id },
    transaction,
    type: QueryTypes.SELECT,
  });
  if (!row) throw notFound('That invitation is not in this co-op.');
  return row;
}

/** The plain-text invitation e-mail. */
export function invitationMail(p: { coopName: string; inviter: string; role: Role; token: string; expiresAt: Date; timezone: string }) {
  const link = appUrl(`/invite/${p.token}`);
  return {
    subject: `Invitation to join ${p.coopName} on Tallyvat`,
    text: [
      'Hello,',
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
 * Sends the invitation e-mail for a freshly made token and records whether the SMTP server
 * took it. The row was committed before sending, so an unreachable mail server leaves a saved
 * invitation marked "not-sent" that an admin can resend. Only the row still carrying this
 * token is marked: a resend that raced ahead keeps its own status.
 */
async function deliver(actor: Actor, id: number, email: string, role: Role, token: string, expiresAt: Date): Promise<InvitationDelivery> {
  const mail = invitationMail({ coopName: actor.coop.name, inviter: actor.user.name, role, token, expiresAt, timezone: actor.coop.timezone });
  const sent = await sendMail({ to: email, ...mail });
  const delivery: InvitationDelivery = sent ? 'sent' : 'not-sent';
  await sequelize.query(
    `UPDATE invitations SET delivery = :delivery, updated_at = now() WHERE id = :id AND coop_id = :coopId AND token_hash = :hash`,
    { replacements: { delivery, id, coopId: actor.coop.id, hash: hashLinkToken(token) } },
  );
  return delivery;
}

async function reloadDto(actor: Actor, id: number): Promise<InvitationDto> {
  const [row] = await sequelize.query<InvitationRow>(`${SELECT_INVITATION} WHERE i.id = :id AND i.coop_id = :coopId`, {
    replacements: { id, coopId: actor.coop.id },
    type: QueryTypes.SELECT,
  });
  if (!row) throw notFound('That invitation is not in this co-op.');
  return toDto(row);
}

/**
 * Invites a person by e-mail with a role. The link's token is 32 random bytes; only its
 * SHA-256 is stored; it expires in 7 days. 409 when the address already belongs to a member
 * or has a pending, unexpired invitation (an expired one is renewed in place).
 */
export async function createInvitation(actor: Actor, input: z.infer<typeof invitationCreateSchema>): Promise<{ invitation: InvitationDto; sent: boolean }> {
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  let id: number;
  try {
    id = await sequelize.transaction(async (transaction) => {
      const member = await sequelize.query(
        `SELECT m.id FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.coop_id = :coopId AND lower(u.email) = :email`,
        { replacements: { coopId: actor.coop.id, email: input.email }, transaction, type: QueryTypes.SELECT },
      );
      if (member.length) throw conflict(`${input.email} is already a member of this co-op.`);
      const [pending] = await sequelize.query<InvitationRow>(
        `${SELECT_INVITATION} WHERE i.coop_id = :coopId AND lower(i.email) = :email AND i.status = 'pending' FOR UPDATE OF i`,
        { replacements: { coopId: actor.coop.id, email: input.email }, transaction, type: QueryTypes.SELECT },
      );
      if (pending && new Date(pending.expires_at).getTime() > Date.now()) {
        throw conflict(`An invitation to ${input.email} is already waiting to be accepted. Resend it or revoke it from the list of invitations.`, {
          invitationId: pending.id,
        });
      }
      if (pending) {
        // The old link has expired: renew the same invitation with a new link and the chosen role.
        await sequelize.query(
          `UPDATE invitations SET role = :role, token_hash = :hash, expires_at = :expiresAt, delivery = 'not-sent',
             invited_by_user_id = :userId, updated_at = now() WHERE id = :id AND coop_id = :coopId`,
          { replacements: { role: input.role, hash, expiresAt, userId: actor.user.id, id: pending.id, coopId: actor.coop.id }, transaction },
        );
        await audit(
          {
            coopId: actor.coop.id, actorUserId: actor.user.id, action: 'invitation.renew', entityType: 'invitation', entityId: pending.id,
            before: { email: pending.email, role: pending.role, expiresAt: new Date(pending.expires_at).toISOString() },
            after: { email: pending.email, role: input.role, expiresAt: expiresAt.toISOString() },
          },
          transaction,
        );
        return pending.id;
      }
      const [created] = await sequelize.query<{ id: number }>(
        `INSERT INTO invitations (coop_id, email, role, token_hash, status, delivery, invited_by_user_id, expires_at)
         VALUES (:coopId, :email, :role, :hash, 'pending', 'not-sent', :userId, :expiresAt) RETURNING id`,
        { replacements: { coopId: actor.coop.id, email: input.email, role: input.role, hash, userId: actor.user.id, expiresAt }, transaction, type: QueryTypes.SELECT },
      );
      await audit(
        {
          coopId: actor.coop.id, actorUserId: actor.user.id, action: 'invitation.create', entityType: 'invitation', entityId: created!.id,
          before: null, after: { email: input.email, role: input.role, expiresAt: expiresAt.toISOString() },
        },
        transaction,
      );
      return created!.id;
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw conflict(`An invitation to ${input.email} was just created. Refresh the list.`);
    throw e;
  }
  const delivery = await deliver(actor, id, input.email, input.role, token, expiresAt);
  return { invitation: await reloadDto(actor, id), sent: delivery === 'sent' };
}

/**
 * Sends a pending invitation again with a NEW link (the old one stops working) valid for 7
 * more days. Used after "not-sent" or when the person lost the e-mail.
 */
export async function resendInvitation(actor: Actor, id: number): Promise<{ invitation: InvitationDto; sent: boolean }> {
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  const row = await sequelize.transaction(async (transaction) => {
    const inv = await findInvitation(actor, id, transaction);
    if (inv.status !== 'pending') throw conflict(`This invitation was already ${inv.status}; it cannot be resent.`);
    await sequelize.query(
      `UPDATE invitations SET token_hash = :hash, expires_at = :expiresAt, delivery = 'not-sent', updated_at = now() WHERE id = :id AND coop_id = :coopId`,
      { replacements: { hash, expiresAt, id, coopId: actor.coop.id }, transaction },
    );
    await audit(
      {
        coopId: actor.coop.id, actorUserId: actor.user.id, action: 'invitation.resend', entityType: 'invitation', entityId: id,
        before: { delivery: inv.delivery, expiresAt: new Date(inv.expires_at).toISOString() },
        after: { delivery: 'not-sent', expiresAt: expiresAt.toISOString(), newLink: true },
      },
      transaction,
    );
    return inv;
  });
  const delivery = await deliver(actor, id, row.email, row.role, token, expiresAt);
  return { invitation: await reloadDto(actor, id), sent: delivery === 'sent' };
}

/** Withdraws a pending invitation; its link then says so. */
export async function revokeInvitation(actor: Actor, id: number): Promise<{ revoked: true; id: number }> {
  return sequelize.transaction(async (transaction) => {
    const inv = await findInvitation(actor, id, transaction);
    if (inv.status !== 'pending') throw conflict(`This invitation was already ${inv.status}.`);
    await sequelize.query(`UPDATE invitations SET status = 'revoked', updated_at = now() WHERE id = :id AND coop_id = :coopId`, {
      replacements: { id, coopId: actor.coop.id },
      transaction,
    });
    await audit(
      {
        coopId: actor.coop.id, actorUserId: actor.user.id, action: 'invitation.revoke', entityType: 'invitation', entityId: id,
        before: { email: inv.email, role: inv.role, status: 'pending' }, after: { email: inv.email, role: inv.role, status: 'revoked' },
      },
      transaction,
    );
    return { revoked: true as const, id };
  });
}

// ---------------------------------------------------------------------------------------------
// The invitee's side: the link in the e-mail. These take no Actor (the token is the credential);
// the signed-in user, if any, decides between "create an account" and "join with this account".

/** Who is opening the link, relative to the invited address. */
export type InviteeAccount = 'new' | 'signed-in' | 'sign-in-needed' | 'other-account';

export interface InvitationInfo {
  coop: { name: string; slug: string };
  role: Role;
  roleSummary: string;
  email: string;
  invitedBy: string | null;
  expiresAt: string;
  account: InviteeAccount;
  signedInAs: string | null;
}

export type InvitationLookup =
  | { state: 'ok'; info: InvitationInfo }
  | { state: 'invalid' }
  | { state: 'revoked' | 'accepted' | 'expired'; coopName: string };

type TokenRow = InvitationRow & { coop_name: string; coop_slug: string; timezone: string; existing_user_id: number | null };

async function findByToken(token: string, transaction?: Transaction): Promise<TokenRow | null> {
  if (!isLinkTokenShape(token)) return null;
  const [row] = await sequelize.query<TokenRow>(
    `SELECT i.id, i.coop_id, i.email, i.role, i.status, i.delivery, i.expires_at, i.created_at, inviter.name AS invited_by,
            c.name AS coop_name, c.slug AS coop_slug, c.timezone,
            (SELECT u.id FROM users u WHERE lower(u.email) = lower(i.email)) AS existing_user_id
     FROM invitations i JOIN coops c ON c.id = i.coop_id LEFT JOIN users inviter ON inviter.id = i.invited_by_user_id
     WHERE i.token_hash = :hash ${transaction ? 'FOR UPDATE OF i' : ''}`,
    { replacements: { hash: hashLinkToken(token) }, transaction, type: QueryTypes.SELECT },
  );
  return row ?? null;
}

function stateOf(row: TokenRow | null): InvitationLookup['state'] {
  if (!row) return 'invalid';
  if (row.status !== 'pending') return row.status;
  return new Date(row.expires_at).getTime() <= Date.now() ? 'expired' : 'ok';
}

function accountOf(row: TokenRow, user: SessionUser | null): InviteeAccount {
  if (!row.existing_user_id) return 'new';
  if (!user) return 'sign-in-needed';
  return user.id === row.existing_user_id ? 'signed-in' : 'other-account';
}

/** What the invitation page shows for a token (never throws for a bad link). */
export async function lookupInvitation(token: string, user: SessionUser | null): Promise<InvitationLookup> {
  const row = await findByToken(token);
  const state = stateOf(row);
  if (state === 'invalid' || !row) return { state: 'invalid' };
  if (state !== 'ok') return { state, coopName: row.coop_name };
  return {
    state: 'ok',
    info: {
      coop: { name: row.coop_name, slug: row.coop_slug },
      role: row.role,
      roleSummary: ROLE_SUMMARY[row.role],
      email: row.email,
      invitedBy: row.invited_by,
      expiresAt: new Date(row.expires_at).toISOString(),
      account: accountOf(row, user),
      signedInAs: user?.email ?? null,
    },
  };
}

export const INVITATION_MESSAGES = {
  invalid: 'This invitation link is not valid. Check that the whole link was copied from the e-mail, or ask the co-op’s admin for a new invitation.',
  revoked: 'This invitation was withdrawn by the co-op’s admin. Ask them for a new one if you still want to join.',
  accepted: 'This invitation has already been used. If that was you, sign in to reach the co-op.',
  expired: 'This invitation has expired. Ask the co-op’s admin to send it again; the new e-mail has a fresh link.',
} as const;

/** The lookup as an HTTP answer: 404 for an unknown link, 410 Gone for a used, withdrawn or expired one. */
export function invitationError(lookup: Exclude<InvitationLookup, { state: 'ok' }>): HttpError {
  if (lookup.state === 'invalid') return notFound(INVITATION_MESSAGES.invalid);
  return new HttpError(410, INVITATION_MESSAGES[lookup.state], undefined, { reason: lookup.state, coop: lookup.coopName });
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
): Promise<{ coop: { slug: string; name: string }; role: Role; email: string; newAccount: boolean }> {
  // bcrypt takes a while: hash before taking the row lock (wasted only for existing accounts).
  const passwordHash = input.password !== undefined ? await hashPassword(input.password) : null;
  try {
    return await sequelize.transaction(async (transaction) => {
      const row = await findByToken(token, transaction);
      const state = stateOf(row);
      if (!row || state === 'invalid') throw invitationError({ state: 'invalid' });
      if (state !== 'ok') throw invitationError({ state, coopName: row.coop_name });

      let userId: number;
      const newAccount = !row.existing_user_id;
      if (row.existing_user_id) {
        if (!user) throw new HttpError(401, `An account already uses ${row.email}. Sign in as ${row.email} to accept.`);
        if (user.id !== row.existing_user_id) {
          throw forbidden(`This invitation is for ${row.email}, but you are signed in as ${user.email}. Sign out, then open the link again.`);
        }
        userId = row.existing_user_id;
      } else {
        const fields: Record<string, string[]> = {};
        if (!input.name) fields.name = ['Enter your name.'];
        if (!passwordHash) fields.password = ['Choose a password of 12 to 128 characters.'];
        else if (isCommonPassword(input.password!)) fields.password = ['That password is on a list of commonly used passwords. Choose another.'];
        if (Object.keys(fields).length) throw new HttpError(422, 'Some fields need attention.', fields);
        const [created] = await sequelize.query<{ id: number }>(
          `INSERT INTO users (email, name, password_hash) VALUES (:email, :name, :hash) RETURNING id`,
          { replacements: { email: row.email.toLowerCase(), name: input.name!, hash: passwordHash! }, transaction, type: QueryTypes.SELECT },
        );
        userId = created!.id;
      }

      const [membership] = await sequelize.query<{ id: number }>(
        `INSERT INTO memberships (coop_id, user_id, role) VALUES (:coopId, :userId, :role)
         ON CONFLICT (coop_id, user_id) DO NOTHING RETURNING id`,
        { replacements: { coopId: row.coop_id, userId, role: row.role }, transaction, type: QueryTypes.SELECT },
      );
      if (!membership) throw conflict(`You are already a member of ${row.coop_name}.`);
      await sequelize.query(`UPDATE invitations SET status = 'accepted', accepted_at = now(), updated_at = now() WHERE id = :id`, {
        replacements: { id: row.id },
        transaction,
      });
      await audit(
        {
          coopId: row.coop_id, actorUserId: userId, action: 'invitation.accept', entityType: 'invitation', entityId: row.id,
          before: { email: row.email, role: row.role, status: 'pending' },
          after: { email: row.email, role: row.role, status: 'accepted', membershipId: membership.id, newAccount },
        },
        transaction,
      );
      await audit(
        {
          coopId: row.coop_id, actorUserId: userId, action: 'membership.create', entityType: 'membership', entityId: membership.id,
          before: null, after: { userId, email: row.email, role: row.role, status: 'active', invitationId: row.id },
        },
        transaction,
      );
      return { coop: { slug: row.coop_slug, name: row.coop_name }, role: row.role, email: row.email.toLowerCase(), newAccount };
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw conflict('An account with this e-mail address was created a moment ago. Sign in, then open the link again.');
    throw e;
  }
}
