import 'server-only';
import type { InferAttributes, Transaction } from 'sequelize';
import { hashLinkToken, isLinkTokenShape } from '@/lib/auth/tokens';
import { HttpError, notFound } from '@/lib/http';
import { AuthToken, User } from '@/models';
import type { AuthTokenKind } from '@/models/AuthToken';

// The single-use links e-mailed to a person (password reset, e-mail change): finding one by its
// token, its state, and the answer for a link that no longer works.

type TokenRow = Pick<InferAttributes<AuthToken>, 'id' | 'userId' | 'newEmail' | 'expiresAt' | 'usedAt'> & {
  user: Pick<InferAttributes<User>, 'email' | 'name'>;
};

/** A link's token row with its person; inside a transaction both rows are locked (FOR UPDATE). */
export async function findToken(
  kind: AuthTokenKind,
  token: string,
  transaction?: Transaction,
): Promise<TokenRow | null> {
  if (!isLinkTokenShape(token)) return null;
  return (await AuthToken.findOne({
    where: { tokenHash: hashLinkToken(token), kind },
    attributes: ['id', 'userId', 'newEmail', 'expiresAt', 'usedAt'],
    include: [{ model: User, as: 'user', required: true, attributes: ['email', 'name'] }],
    ...(transaction && { transaction, lock: transaction.LOCK.UPDATE }),
    raw: true,
    nest: true,
  })) as unknown as TokenRow | null;
}

export type LinkState = 'ok' | 'invalid' | 'used' | 'expired';

export function linkState(row: TokenRow | null): LinkState {
  if (!row) return 'invalid';
  if (row.usedAt) return 'used';
  return new Date(row.expiresAt).getTime() <= Date.now() ? 'expired' : 'ok';
}

export const RESET_MESSAGES: Record<Exclude<LinkState, 'ok'>, string> = {
  invalid: 'This password-reset link is not valid. Check that the whole link was copied, or ask for a new one.',
  used: 'This password-reset link has already been used. Ask for a new one if you need to reset your password again.',
  expired: 'This password-reset link has expired (links work for one hour). Ask for a new one.',
};
export const EMAIL_MESSAGES: Record<Exclude<LinkState, 'ok'>, string> = {
  invalid:
    'This confirmation link is not valid. Check that the whole link was copied, or change your e-mail address again from your profile.',
  used: 'This confirmation link has already been used or was replaced by a newer one.',
  expired:
    'This confirmation link has expired (links work for 24 hours). Change your e-mail address again from your profile.',
};

export function linkError(state: Exclude<LinkState, 'ok'>, messages: typeof RESET_MESSAGES): HttpError {
  return state === 'invalid'
    ? notFound(messages.invalid)
    : new HttpError(410, messages[state], undefined, { reason: state });
}
