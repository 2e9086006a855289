import 'server-only';
import { fn, Op, UniqueConstraintError, type InferAttributes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type * as dto from '@/lib/api/dto/core';
import { audit } from '@/lib/audit';
import type { SessionUser } from '@/lib/auth';
import { emailIs } from '@/lib/auth/email';
import { hashPassword, isCommonPassword, verifyPassword } from '@/lib/auth/passwords';
import {
  CURRENT_PASSWORD_WINDOW_MINUTES,
  currentPasswordWaitSeconds,
  recordCurrentPasswordFailure,
} from '@/lib/auth/rate-limit';
import { revokeAllSessions } from '@/lib/auth/sessions';
import { EMAIL_CHANGE_TTL_MS, newLinkToken } from '@/lib/auth/tokens';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, invalidFields } from '@/lib/http';
import { emailChangeMailKey, enqueueMail, QUEUES } from '@/lib/jobs';
import { newestJobState } from '@/lib/jobs/queries';
import { appUrl } from '@/lib/mail';
import { formatExpiry } from '@/lib/account/format';
import { personTimeZone } from '@/lib/account/zone';
import type { emailChangeSchema, passwordChangeSchema, profileUpdateSchema } from '@/lib/validation/auth';
import { AuthToken, Coop, MailSend, Membership, User } from '@/models';
import { EMAIL_MESSAGES, findToken, linkError, linkState, type LinkState } from './links';
import { COMMON } from './password-reset';

export { type LinkState } from './links';
export {
  RESET_REQUESTED,
  RESET_REQUESTS_PER_HOUR,
  requestPasswordReset,
  lookupPasswordReset,
  checkPasswordReset,
  resetPassword,
} from './password-reset';

// The signed-in person's own account: profile, password, e-mail address, sessions, and the
// password-reset links. These belong to no single co-op; changes other members can see (name,
// e-mail) are written to the audit log of every co-op the person belongs to.

/** My profile: the API's Profile. */
export type ProfileDto = z.infer<typeof dto.profileSchema>;

/** queued: the worker has it (retrying while the mail server is away); sent: the server took it; failed: every try failed. */
export type PendingEmailDelivery = 'queued' | 'sent' | 'failed';

/**
 * Where the confirmation e-mail of a pending e-mail change stands: its ledger row (sent, or in
 * flight), else the state of its mail job (waiting or retrying: queued; failed after the last
 * try, or gone: failed).
 */
async function emailChangeDelivery(authTokenId: number): Promise<NonNullable<ProfileDto['pendingEmailDelivery']>> {
  const key = emailChangeMailKey(authTokenId);
  const sent = await MailSend.findOne({
    where: { subject: key },
    attributes: ['state', 'sentAt'],
    order: [['generation', 'DESC']],
    raw: true,
  });
  if (sent?.state === 'sent')
    return { status: 'sent', sentAt: sent.sentAt ? new Date(sent.sentAt).toISOString() : null };
  if (sent) return { status: 'queued', sentAt: null };
  const job = await newestJobState(QUEUES.mail, key);
  return { status: job === 'created' || job === 'retry' || job === 'active' ? 'queued' : 'failed', sentAt: null };
}

type MyMembership = Pick<InferAttributes<Membership>, 'role' | 'status' | 'joinedAt'> & {
  coop: Pick<InferAttributes<Coop>, 'slug' | 'name' | 'timezone'>;
};

/** The profile page's data: name, e-mail, any pending e-mail change, co-ops with role. */
export async function getProfile(user: SessionUser): Promise<ProfileDto> {
  const [coops, pending] = await Promise.all([
    Membership.findAll({
      where: { userId: user.id },
      attributes: ['role', 'status', 'joinedAt'],
      include: [{ model: Coop, as: 'coop', required: true, attributes: ['slug', 'name', 'timezone'] }],
      order: [[{ model: Coop, as: 'coop' }, 'name', 'ASC']],
      raw: true,
      nest: true,
    }) as unknown as Promise<MyMembership[]>,
    AuthToken.findOne({
      where: { userId: user.id, kind: 'email-change', usedAt: null, expiresAt: { [Op.gt]: fn('now') } },
      attributes: ['id', 'newEmail'],
      order: [['createdAt', 'DESC']],
      raw: true,
    }),
  ]);
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    pendingEmail: pending?.newEmail ?? null,
    pendingEmailDelivery: pending ? await emailChangeDelivery(pending.id) : null,
    coops: coops.map((m) => ({
      slug: m.coop.slug,
      name: m.coop.name,
      role: m.role,
      status: m.status,
      joinedAt: new Date(m.joinedAt).toISOString(),
      timezone: m.coop.timezone,
    })),
  };
}

/** Writes one audit event into each co-op the person belongs to (their name and e-mail show there). */
async function auditInMyCoops(
  userId: number,
  action: string,
  before: unknown,
  after: unknown,
  transaction: Transaction,
) {
  const memberships = await Membership.findAll({ where: { userId }, attributes: ['coopId'], raw: true, transaction });
  for (const m of memberships) {
    await audit(
      { coopId: m.coopId, actorUserId: userId, action, entityType: 'user', entityId: userId, before, after },
      transaction,
    );
  }
}

/** Renames the signed-in person. */
export async function updateProfile(
  user: SessionUser,
  input: z.infer<typeof profileUpdateSchema>,
): Promise<z.infer<typeof dto.nameChangedSchema>> {
  if (input.name === user.name) return { name: user.name };
  await inTransaction(async (transaction) => {
    await User.update({ name: input.name }, { where: { id: user.id }, transaction });
    await auditInMyCoops(user.id, 'user.rename', { name: user.name }, { name: input.name }, transaction);
  });
  return { name: input.name };
}

/**
 * Checks the current password asked for inside a session (e-mail or password change). Wrong
 * guesses are throttled per person: after 5 wrong in 15 minutes, 429 until the oldest ages out
 * (a stolen session cannot be used to guess the password).
 */
async function checkCurrentPassword(user: SessionUser, plain: string, field: string) {
  const wait = await currentPasswordWaitSeconds(user.email);
  if (wait > 0) {
    throw new HttpError(
      429,
      `Too many wrong passwords. Wait up to ${CURRENT_PASSWORD_WINDOW_MINUTES} minutes and try again.`,
      undefined,
      { retryAfter: wait },
    );
  }
  const row = await User.findByPk(user.id, { attributes: ['passwordHash'], raw: true });
  if (!(await verifyPassword(plain, row?.passwordHash))) {
    await recordCurrentPasswordFailure(user.email);
    throw invalidFields({ [field]: ['That is not your current password.'] });
  }
}

/**
 * Changes the password (the current one is required) and revokes every session of this person, this one included: the browser signs in again with the
 * new password right after (the profile form does it), other devices must sign in again.
 */
export async function changePassword(
  user: SessionUser,
  input: z.infer<typeof passwordChangeSchema>,
): Promise<z.infer<typeof dto.passwordChangedSchema>> {
  if (isCommonPassword(input.newPassword)) throw invalidFields({ newPassword: [COMMON] });
  if (input.newPassword === input.currentPassword)
    throw invalidFields({ newPassword: ['Choose a password different from the current one.'] });
  await checkCurrentPassword(user, input.currentPassword, 'currentPassword');
  const hash = await hashPassword(input.newPassword);
  await inTransaction(async (transaction) => {
    await User.update({ passwordHash: hash }, { where: { id: user.id }, transaction });
    await revokeAllSessions(user.id, transaction);
  });
  return { changed: true };
}

/** Ends every session of this person on every device (this one too). */
export async function signOutEverywhere(user: SessionUser): Promise<z.infer<typeof dto.signedOutSchema>> {
  await revokeAllSessions(user.id);
  return { signedOut: true };
}

const emailTaken = async (email: string, exceptUserId: number, transaction?: Transaction) =>
  (await User.count({ where: { [Op.and]: [emailIs(email), { id: { [Op.ne]: exceptUserId } }] }, transaction })) > 0;

/**
 * Starts a change of e-mail address: after checking the current password, a single-use link
 * valid for 24 hours goes to the NEW address; the address changes only when it is opened.
 * An earlier pending change is cancelled. The answer is the same when another account uses the
 * address (nothing reveals who has an account): then no link is made, and that account's owner
 * is told by e-mail that someone tried to move an account to their address.
 */
export async function requestEmailChange(
  user: SessionUser,
  input: z.infer<typeof emailChangeSchema>,
): Promise<z.infer<typeof dto.emailChangeRequestedSchema>> {
  if (input.email === user.email.toLowerCase())
    throw invalidFields({ email: ['That is already your e-mail address.'] });
  await checkCurrentPassword(user, input.currentPassword, 'currentPassword');
  if (await emailTaken(input.email, user.id)) {
    // Mail jobs (one per message, retried with back-off): the answer does not wait for SMTP.
    await enqueueMail({
      to: input.email,
      subject: 'Someone tried to use your e-mail address on Tallyvat',
      text: [
        'Hello,',
        '',
        `Someone signed in to another Tallyvat account asked to change that account's e-mail address to ${input.email}.`,
        'That address already belongs to your account, so nothing was changed and your account is as it was.',
        '',
        'If this was you, sign in with this address instead. If not, you need not do anything.',
        '',
        '-- ',
        'Tallyvat',
      ].join('\n'),
    });
    return { pendingEmail: input.email, sent: true };
  }
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(Date.now() + EMAIL_CHANGE_TTL_MS);
  const zone = await personTimeZone(user.id);
  await inTransaction(async (transaction) => {
    await AuthToken.update(
      { usedAt: fn('now') },
      { where: { userId: user.id, kind: 'email-change', usedAt: null }, transaction },
    );
    const link = await AuthToken.create(
      { userId: user.id, kind: 'email-change', tokenHash: hash, newEmail: input.email, expiresAt, usedAt: null },
      { transaction },
    );
    // The link's e-mail is a job written by this transaction: it exists exactly when the link does.
    await enqueueMail(
      {
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
          `The link works once and expires on ${formatExpiry(expiresAt, zone)}.`,
          'If you did not ask for this, ignore this e-mail: your address stays as it is.',
          '',
          '-- ',
          'Tallyvat',
        ].join('\n'),
      },
      // Its own ledger subject (email-change.<link id>): the profile shows how the e-mail is doing.
      { kind: 'email-change', authTokenId: link.id },
      transaction,
    );
  });
  return { pendingEmail: input.email, sent: true };
}

/** What the e-mail confirmation page shows for a link. */
export async function lookupEmailChange(
  token: string,
): Promise<{ state: 'ok'; newEmail: string; oldEmail: string } | { state: Exclude<LinkState, 'ok'>; message: string }> {
  const row = await findToken('email-change', token);
  const state = linkState(row);
  if (state !== 'ok' || !row)
    return { state: state === 'ok' ? 'invalid' : state, message: EMAIL_MESSAGES[state === 'ok' ? 'invalid' : state] };
  return { state: 'ok', newEmail: row.newEmail!, oldEmail: row.user.email };
}

/**
 * Confirms a change of e-mail address from the link sent to the new address (works without a
 * session: the link is the proof). The old address gets a notice.
 */
export async function confirmEmailChange(token: string): Promise<z.infer<typeof dto.accountEmailSchema>> {
  const result = await (async () => {
    try {
      return await inTransaction(async (transaction) => {
        const row = await findToken('email-change', token, transaction);
        const state = linkState(row);
        if (state !== 'ok' || !row) throw linkError(state === 'ok' ? 'invalid' : state, EMAIL_MESSAGES);
        const email = row.newEmail!;
        if (await emailTaken(email, row.userId, transaction))
          throw conflict('Another account started using that e-mail address in the meantime.');
        await User.update({ email }, { where: { id: row.userId }, transaction });
        await AuthToken.update({ usedAt: fn('now') }, { where: { id: row.id }, transaction });
        await auditInMyCoops(row.userId, 'user.email-change', { email: row.user.email }, { email }, transaction);
        return { oldEmail: row.user.email, email, name: row.user.name };
      });
    } catch (e) {
      if (e instanceof UniqueConstraintError)
        throw conflict('Another account started using that e-mail address in the meantime.');
      throw e;
    }
  })();
  // A notice to the old address: a mail job (retried while the mail server is down).
  await enqueueMail({
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
