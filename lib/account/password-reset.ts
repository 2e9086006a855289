import 'server-only';
import { fn, Op, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { accountEmailSchema } from '@/lib/api/dto/core';
import { emailIs } from '@/lib/auth/email';
import { hashPassword, isCommonPassword } from '@/lib/auth/passwords';
import { revokeAllSessions } from '@/lib/auth/sessions';
import { newLinkToken, PASSWORD_RESET_TTL_MS } from '@/lib/auth/tokens';
import { inTransaction } from '@/lib/db';
import { invalidFields } from '@/lib/http';
import { appUrl } from '@/lib/mail';
import { formatExpiry } from '@/lib/account/format';
import { personTimeZone } from '@/lib/account/zone';
import type { passwordResetSchema } from '@/lib/validation/auth';
import { AuthToken, SignInAttempt, User } from '@/models';
import { findToken, linkError, linkState, RESET_MESSAGES, type LinkState } from './links';

// Forgotten passwords: the e-mailed single-use link, and setting a new password from it.

export const COMMON = 'That password is on a list of commonly used passwords. Choose another.';

/** The one answer to every reset request. */
export const RESET_REQUESTED =
  'If an account uses that address, we have e-mailed it a link to choose a new password. The link works for one hour.';

/** Reset e-mails per account per hour beyond which requests are quietly dropped (stops mail bombing). */
export const RESET_REQUESTS_PER_HOUR = 3;

/**
 * A new single-use link to choose the password of `userId`, valid PASSWORD_RESET_TTL_MS: only the
 * token's hash is stored. The reset page takes it (also the operator's first-person link).
 * @returns the link (`/reset-password/<token>` on APP_URL) and when it expires
 */
export async function newPasswordResetLink(
  userId: number,
  transaction?: Transaction,
): Promise<{ link: string; expiresAt: Date }> {
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + PASSWORD_RESET_TTL_MS);
  await AuthToken.create(
    { userId, kind: 'password-reset', tokenHash: hash, newEmail: null, expiresAt, usedAt: null },
    { transaction },
  );
  return { link: appUrl(`/reset-password/${token}`), expiresAt };
}

/**
 * Starts a password reset. Always answers the same, whether or not an account uses the address
 * (nothing reveals who has an account). When one does, a single-use link valid for one hour is
 * e-mailed, at most RESET_REQUESTS_PER_HOUR times an hour. Returns the e-mail to send (the
 * route sends it after answering, so both cases take the same time).
 */
export async function requestPasswordReset(
  email: string,
): Promise<{ to: string; subject: string; text: string } | null> {
  const user = await User.findOne({ where: emailIs(email), attributes: ['id', 'name', 'email'], raw: true });
  if (!user) return null;
  const hourAgo = new Date(Date.now() - 60 * 60 * 1000);
  const recent = await AuthToken.count({
    where: { userId: user.id, kind: 'password-reset', createdAt: { [Op.gt]: hourAgo } },
  });
  if (recent >= RESET_REQUESTS_PER_HOUR) return null;
  const { link, expiresAt } = await newPasswordResetLink(user.id);
  return {
    to: user.email,
    subject: 'Reset your Tallyvat password',
    text: [
      `Hello ${user.name},`,
      '',
      'Someone (we hope you) asked to reset the password of your Tallyvat account.',
      'To choose a new password, open this link:',
      '',
      `  ${link}`,
      '',
      `The link works once and expires on ${formatExpiry(expiresAt, await personTimeZone(user.id))}.`,
      'Setting a new password signs you out on every device.',
      'If you did not ask for this, ignore this e-mail: your password stays as it is.',
      '',
      '-- ',
      'Tallyvat',
    ].join('\n'),
  };
}

/** What the reset page shows for a link. */
export async function lookupPasswordReset(
  token: string,
): Promise<{ state: 'ok'; email: string } | { state: Exclude<LinkState, 'ok'>; message: string }> {
  const row = await findToken('password-reset', token);
  const state = linkState(row);
  if (state !== 'ok' || !row)
    return { state: state === 'ok' ? 'invalid' : state, message: RESET_MESSAGES[state === 'ok' ? 'invalid' : state] };
  return { state: 'ok', email: row.user.email };
}

/** The link's state as an HTTP answer (for GET /api/password-reset/[token]). */
export async function checkPasswordReset(token: string): Promise<z.infer<typeof accountEmailSchema>> {
  const r = await lookupPasswordReset(token);
  if (r.state !== 'ok') throw linkError(r.state, RESET_MESSAGES);
  return { email: r.email };
}

/**
 * Sets a new password from a reset link: single use (the token row is locked and marked used,
 * with every other reset link of the person), and every session of the person is revoked.
 */
export async function resetPassword(
  token: string,
  input: z.infer<typeof passwordResetSchema>,
): Promise<z.infer<typeof accountEmailSchema>> {
  const pre = await findToken('password-reset', token);
  const preState = linkState(pre);
  if (preState !== 'ok') throw linkError(preState, RESET_MESSAGES);
  if (isCommonPassword(input.password)) throw invalidFields({ password: [COMMON] });
  const hash = await hashPassword(input.password);
  return inTransaction(async (transaction) => {
    const row = await findToken('password-reset', token, transaction);
    const state = linkState(row);
    if (state !== 'ok' || !row) throw linkError(state === 'ok' ? 'invalid' : state, RESET_MESSAGES);
    await User.update({ passwordHash: hash }, { where: { id: row.userId }, transaction });
    await revokeAllSessions(row.userId, transaction);
    await AuthToken.update(
      { usedAt: fn('now') },
      { where: { userId: row.userId, kind: 'password-reset', usedAt: null }, transaction },
    );
    // The sign-in limit tells a locked-out person to reset their password: doing so lifts the
    // account's lock (failures counted per address still apply).
    await SignInAttempt.destroy({ where: { [Op.and]: [emailIs(row.user.email), { succeeded: false }] }, transaction });
    return { email: row.user.email };
  });
}
