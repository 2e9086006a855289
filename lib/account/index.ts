import 'server-only';
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { SessionUser } from '@/lib/auth';
import { hashPassword, isCommonPassword, verifyPassword } from '@/lib/auth/passwords';
import type { Role } from '@/lib/auth/roles';
import { EMAIL_CHANGE_TTL_MS, hashLinkToken, isLinkTokenShape, newLinkToken, PASSWORD_RESET_TTL_MS } from '@/lib/auth/tokens';
import { conflict, HttpError, notFound } from '@/lib/http';
import { appUrl, sendMail } from '@/lib/mail';
import { formatExpiry } from '@/lib/account/format';
import type {
  emailChangeSchema, passwordChangeSchema, passwordResetSchema, profileUpdateSchema,
} from '@/lib/validation/auth';
import { sequelize } from '@/models';

// The signed-in person's own account: profile, password, e-mail address, sessions, and the
// password-reset links. These belong to no single co-op; changes other members can see (name,
// e-mail) are written to the audit log of every co-op the person belongs to.

export interface ProfileDto {
  id: number;
  name: string;
  email: string;
  /** A change of address waiting for its confirmation link, if any. */
  pendingEmail: string | null;
  coops: { slug: string; name: string; role: Role; status: 'active' | 'suspended'; joinedAt: string; timezone: string }[];
}

const invalidFields = (fields: Record<string, string[]>) => new HttpError(422, 'Some fields need attention.', fields);
const COMMON = 'That password is on a list of commonly used passwords. Choose another.';

/** The profile page's data: name, e-mail, any pending e-mail change, co-ops with role. */
export async function getProfile(user: SessionUser): Promise<ProfileDto> {
  const [coops, pending] = await Promise.all([
    sequelize.query<{ slug: string; name: string; role: Role; status: 'active' | 'suspended'; joined_at: Date | string; timezone: string }>(
      `SELECT c.slug, c.name, m.role, m.status, m.joined_at, c.timezone FROM memberships m JOIN coops c ON c.id = m.coop_id
       WHERE m.user_id = :userId ORDER BY c.name`,
      { replacements: { userId: user.id }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ new_email: string }>(
      `SELECT new_email FROM auth_tokens WHERE user_id = :userId AND kind = 'email-change' AND used_at IS NULL AND expires_at > now()
       ORDER BY created_at DESC LIMIT 1`,
      { replacements: { userId: user.id }, type: QueryTypes.SELECT },
    ),
  ]);
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    pendingEmail: pending[0]?.new_email ?? null,
    coops: coops.map((c) => ({ slug: c.slug, name: c.name, role: c.role, status: c.status, joinedAt: new Date(c.joined_at).toISOString(), timezone: c.timezone })),
  };
}

/** Writes one audit event into each co-op the person belongs to (their name and e-mail show there). */
async function auditInMyCoops(userId: number, action: string, before: unknown, after: unknown, transaction: Transaction) {
  const coops = await sequelize.query<{ coop_id: number }>('SELECT coop_id FROM memberships WHERE user_id = :userId', {
    replacements: { userId },
    transaction,
    type: QueryTypes.SELECT,
  });
  for (const c of coops) {
    await audit({ coopId: c.coop_id, actorUserId: userId, action, entityType: 'user', entityId: userId, before, after }, transaction);
  }
}

/** Renames the signed-in person. */
export async function updateProfile(user: SessionUser, input: z.infer<typeof profileUpdateSchema>): Promise<{ name: string }> {
  if (input.name === user.name) return { name: user.name };
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('UPDATE users SET name = :name, updated_at = now() WHERE id = :id', { replacements: { name: input.name, id: user.id }, transaction });
    await auditInMyCoops(user.id, 'user.rename', { name: user.name }, { name: input.name }, transaction);
  });
  return { name: input.name };
}

async function checkCurrentPassword(userId: number, plain: string, field: string) {
  const [row] = await sequelize.query<{ password_hash: string | null }>('SELECT password_hash FROM users WHERE id = :id', {
    replacements: { id: userId },
    type: QueryTypes.SELECT,
  });
  if (!(await verifyPassword(plain, row?.password_hash))) throw invalidFields({ [field]: ['That is not your current password.'] });
}

/**
 * Changes the password (the current one is required) and bumps the session version, which
 * ends every session of this person, this one included: the browser signs in again with the
 * new password right after (the profile form does it), other devices must sign in again.
 */
export async function changePassword(user: SessionUser, input: z.infer<typeof passwordChangeSchema>): Promise<{ changed: true }> {
  if (isCommonPassword(input.newPassword)) throw invalidFields({ newPassword: [COMMON] });
  if (input.newPassword === input.currentPassword) throw invalidFields({ newPassword: ['Choose a password different from the current one.'] });
  await checkCurrentPassword(user.id, input.currentPassword, 'currentPassword');
  const hash = await hashPassword(input.newPassword);
  await sequelize.query('UPDATE users SET password_hash = :hash, session_version = session_version + 1, updated_at = now() WHERE id = :id', {
    replacements: { hash, id: user.id },
  });
  return { changed: true };
}

/** Ends every session of this person on every device (this one too). */
export async function signOutEverywhere(user: SessionUser): Promise<{ signedOut: true }> {
  await sequelize.query('UPDATE users SET session_version = session_version + 1, updated_at = now() WHERE id = :id', { replacements: { id: user.id } });
  return { signedOut: true };
}

const emailTaken = async (email: string, exceptUserId: number, transaction?: Transaction) =>
  (
    await sequelize.query('SELECT id FROM users WHERE lower(email) = :email AND id <> :id', {
      replacements: { email: email.toLowerCase(), id: exceptUserId },
      transaction,
      type: QueryTypes.SELECT,
    })
  ).length > 0;

/**
 * Starts a change of e-mail address: after checking the current password, a single-use link
 * valid for 24 hours goes to the NEW address; the address changes only when it is opened.
 * An earlier pending change is cancelled. 409 when another account uses the address.
 */
export async function requestEmailChange(user: SessionUser, input: z.infer<typeof emailChangeSchema>): Promise<{ pendingEmail: string; sent: boolean }> {
  if (input.email === user.email.toLowerCase()) throw invalidFields({ email: ['That is already your e-mail address.'] });
  await checkCurrentPassword(user.id, input.currentPassword, 'currentPassword');
  if (await emailTaken(input.email, user.id)) throw conflict('Another account already uses that e-mail address.');
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + EMAIL_CHANGE_TTL_MS);
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `UPDATE auth_tokens SET used_at = now() WHERE user_id = :userId AND kind = 'email-change' AND used_at IS NULL`,
      { replacements: { userId: user.id }, transaction },
    );
    await sequelize.query(
      `INSERT INTO auth_tokens (user_id, kind, token_hash, new_email, expires_at) VALUES (:userId, 'email-change', :hash, :email, :expiresAt)`,
      { replacements: { userId: user.id, hash, email: input.email, expiresAt }, transaction },
    );
  });
  const sent = await sendMail({
    to: input.email,
    subject: 'Confirm your new e-mail address for Tallyvat',
    text: [
      `Hello ${user.name},`,
      '',
      `You asked to change the e-mail address of your Tallyvat account from ${user.email} to ${input.email}.`,
      'To confirm, open this link:',
      '',
      `  ${appUrl(`/confirm-email/${token}`)}`,
      '',
      `The link works once and expires on ${formatExpiry(expiresAt)}.`,
      'If you did not ask for this, ignore this e-mail: your address stays as it is.',
      '',
      '-- ',
      'Tallyvat',
    ].join('\n'),
  });
  return { pendingEmail: input.email, sent };
}

type TokenRow = { id: number; user_id: number; new_email: string | null; expires_at: Date | string; used_at: Date | string | null; email: string; name: string };

async function findToken(kind: 'password-reset' | 'email-change', token: string, transaction?: Transaction): Promise<TokenRow | null> {
  if (!isLinkTokenShape(token)) return null;
  const [row] = await sequelize.query<TokenRow>(
    `SELECT t.id, t.user_id, t.new_email, t.expires_at, t.used_at, u.email, u.name
     FROM auth_tokens t JOIN users u ON u.id = t.user_id
     WHERE t.token_hash = :hash AND t.kind = :kind ${transaction ? 'FOR UPDATE OF t, u' : ''}`,
    { replacements: { hash: hashLinkToken(token), kind }, transaction, type: QueryTypes.SELECT },
  );
  return row ?? null;
}

export type LinkState = 'ok' | 'invalid' | 'used' | 'expired';

function linkState(row: TokenRow | null): LinkState {
  if (!row) return 'invalid';
  if (row.used_at) return 'used';
  return new Date(row.expires_at).getTime() <= Date.now() ? 'expired' : 'ok';
}

const RESET_MESSAGES: Record<Exclude<LinkState, 'ok'>, string> = {
  invalid: 'This password-reset link is not valid. Check that the whole link was copied, or ask for a new one.',
  used: 'This password-reset link has already been used. Ask for a new one if you need to reset your password again.',
  expired: 'This password-reset link has expired (links work for one hour). Ask for a new one.',
};
const EMAIL_MESSAGES: Record<Exclude<LinkState, 'ok'>, string> = {
  invalid: 'This confirmation link is not valid. Check that the whole link was copied, or change your e-mail address again from your profile.',
  used: 'This confirmation link has already been used or was replaced by a newer one.',
  expired: 'This confirmation link has expired (links work for 24 hours). Change your e-mail address again from your profile.',
};

function linkError(state: Exclude<LinkState, 'ok'>, messages: typeof RESET_MESSAGES): HttpError {
  return state === 'invalid' ? notFound(messages.invalid) : new HttpError(410, messages[state], undefined, { reason: state });
}

/** What the e-mail confirmation page shows for a link. */
export async function lookupEmailChange(token: string): Promise<{ state: 'ok'; newEmail: string; oldEmail: string } | { state: Exclude<LinkState, 'ok'>; message: string }> {
  const row = await findToken('email-change', token);
  const state = linkState(row);
  if (state !== 'ok' || !row) return { state: state === 'ok' ? 'invalid' : state, message: EMAIL_MESSAGES[state === 'ok' ? 'invalid' : state] };
  return { state: 'ok', newEmail: row.new_email!, oldEmail: row.email };
}

/**
 * Confirms a change of e-mail address from the link sent to the new address (works without a
 * session: the link is the proof). The old address gets a notice.
 */
export async function confirmEmailChange(token: string): Promise<{ email: string }> {
  const result = await (async () => {
    try {
      return await sequelize.transaction(async (transaction) => {
        const row = await findToken('email-change', token, transaction);
        const state = linkState(row);
        if (state !== 'ok' || !row) throw linkError(state === 'ok' ? 'invalid' : state, EMAIL_MESSAGES);
        if (await emailTaken(row.new_email!, row.user_id, transaction)) throw conflict('Another account started using that e-mail address in the meantime.');
        await sequelize.query('UPDATE users SET email = :email, updated_at = now() WHERE id = :id', { replacements: { email: row.new_email, id: row.user_id }, transaction });
        await sequelize.query('UPDATE auth_tokens SET used_at = now() WHERE id = :id', { replacements: { id: row.id }, transaction });
        await auditInMyCoops(row.user_id, 'user.email-change', { email: row.email }, { email: row.new_email }, transaction);
        return { oldEmail: row.email, email: row.new_email!, name: row.name };
      });
    } catch (e) {
      if (e instanceof UniqueConstraintError) throw conflict('Another account started using that e-mail address in the meantime.');
      throw e;
    }
  })();
  await sendMail({
    to: result.oldEmail,
    subject: 'Your Tallyvat e-mail address was changed',
    text: [
      `Hello ${result.name},`,
      '',
      `The e-mail address of your Tallyvat account was changed from ${result.oldEmail} to ${result.email}.`,
      'From now on, sign in with the new address.',
      '',
      'If you did not make this change, reply to your co-op’s admin at once: someone may have your password.',
      '',
      '-- ',
      'Tallyvat',
    ].join('\n'),
  });
  return { email: result.email };
}

/** The one answer to every reset request. */
export const RESET_REQUESTED = 'If an account uses that address, we have e-mailed it a link to choose a new password. The link works for one hour.';

/** Reset e-mails per account per hour beyond which requests are quietly dropped (stops mail bombing). */
export const RESET_REQUESTS_PER_HOUR = 3;

/**
 * Starts a password reset. Always answers the same, whether or not an account uses the address
 * (nothing reveals who has an account). When one does, a single-use link valid for one hour is
 * e-mailed, at most RESET_REQUESTS_PER_HOUR times an hour. Returns the e-mail to send (the
 * route sends it after answering, so both cases take the same time).
 */
export async function requestPasswordReset(email: string): Promise<{ to: string; subject: string; text: string } | null> {
  const [user] = await sequelize.query<{ id: number; name: string; email: string; recent: string }>(
    `SELECT u.id, u.name, u.email,
            (SELECT count(*) FROM auth_tokens t WHERE t.user_id = u.id AND t.kind = 'password-reset' AND t.created_at > now() - interval '1 hour') AS recent
     FROM users u WHERE lower(u.email) = :email`,
    { replacements: { email: email.toLowerCase() }, type: QueryTypes.SELECT },
  );
  if (!user || Number(user.recent) >= RESET_REQUESTS_PER_HOUR) return null;
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + PASSWORD_RESET_TTL_MS);
  await sequelize.query(`INSERT INTO auth_tokens (user_id, kind, token_hash, expires_at) VALUES (:userId, 'password-reset', :hash, :expiresAt)`, {
    replacements: { userId: user.id, hash, expiresAt },
  });
  return {
    to: user.email,
    subject: 'Reset your Tallyvat password',
    text: [
      `Hello ${user.name},`,
      '',
      'Someone (we hope you) asked to reset the password of your Tallyvat account.',
      'To choose a new password, open this link:',
      '',
      `  ${appUrl(`/reset-password/${token}`)}`,
      '',
      `The link works once and expires on ${formatExpiry(expiresAt)}.`,
      'Setting a new password signs you out on every device.',
      'If you did not ask for this, ignore this e-mail: your password stays as it is.',
      '',
      '-- ',
      'Tallyvat',
    ].join('\n'),
  };
}

/** What the reset page shows for a link. */
export async function lookupPasswordReset(token: string): Promise<{ state: 'ok'; email: string } | { state: Exclude<LinkState, 'ok'>; message: string }> {
  const row = await findToken('password-reset', token);
  const state = linkState(row);
  if (state !== 'ok' || !row) return { state: state === 'ok' ? 'invalid' : state, message: RESET_MESSAGES[state === 'ok' ? 'invalid' : state] };
  return { state: 'ok', email: row.email };
}

/** The link's state as an HTTP answer (for GET /api/password-reset/[token]). */
export async function checkPasswordReset(token: string): Promise<{ email: string }> {
  const r = await lookupPasswordReset(token);
  if (r.state !== 'ok') throw linkError(r.state, RESET_MESSAGES);
  return { email: r.email };
}

/**
 * Sets a new password from a reset link: single use (the token row is locked and marked used,
 * with every other reset link of the person), and every session ends (session version bumped).
 */
export async function resetPassword(token: string, input: z.infer<typeof passwordResetSchema>): Promise<{ email: string }> {
  const pre = await findToken('password-reset', token);
  const preState = linkState(pre);
  if (preState !== 'ok') throw linkError(preState, RESET_MESSAGES);
  if (isCommonPassword(input.password)) throw invalidFields({ password: [COMMON] });
  const hash = await hashPassword(input.password);
  return sequelize.transaction(async (transaction) => {
    const row = await findToken('password-reset', token, transaction);
    const state = linkState(row);
    if (state !== 'ok' || !row) throw linkError(state === 'ok' ? 'invalid' : state, RESET_MESSAGES);
    await sequelize.query('UPDATE users SET password_hash = :hash, session_version = session_version + 1, updated_at = now() WHERE id = :id', {
      replacements: { hash, id: row.user_id },
      transaction,
    });
    await sequelize.query(`UPDATE auth_tokens SET used_at = now() WHERE user_id = :userId AND kind = 'password-reset' AND used_at IS NULL`, {
      replacements: { userId: row.user_id },
      transaction,
    });
    // The sign-in limit tells a locked-out person to reset their password: doing so lifts the
    // account's lock (failures counted per address still apply).
    await sequelize.query('DELETE FROM sign_in_attempts WHERE lower(email) = lower(:email) AND NOT succeeded', {
      replacements: { email: row.email },
      transaction,
    });
    return { email: row.email };
  });
}
