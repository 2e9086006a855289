import 'server-only';
import crypto from 'node:crypto';

/** How long the links we e-mail stay valid. */
export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;
export const PASSWORD_RESET_TTL_MS = 60 * 60 * 1000;
export const EMAIL_CHANGE_TTL_MS = 24 * 60 * 60 * 1000;

/** 32 random bytes in base64url: always 43 characters from [A-Za-z0-9_-]. */
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{43}$/;

/**
 * A fresh link token and the SHA-256 (hex) we store in its place: a leaked database does not
 * hand out working links, and a link is looked up by its hash alone.
 */
export function newLinkToken(): { token: string; hash: string } {
  const token = crypto.randomBytes(32).toString('base64url');
  return { token, hash: hashLinkToken(token) };
}

/**
 * A link token derived from a stored seed with the server's secret (HMAC-SHA-256, base64url: the
 * same shape as a random one). The database holds the seed and the token's hash, not the token;
 * the same seed always gives the same token, so an e-mail sent again after an ambiguous send
 * carries the same link. `purpose` keeps tokens for different uses apart.
 */
export function derivedLinkToken(purpose: string, seed: string): { token: string; hash: string } {
  const secret = process.env.NEXTAUTH_SECRET;
  if (!secret) throw new Error('NEXTAUTH_SECRET is not set');
  const token = crypto.createHmac('sha256', secret).update(`${purpose}\n${seed}`).digest('base64url');
  return { token, hash: hashLinkToken(token) };
}

export function hashLinkToken(token: string): string {
  return crypto.createHash('sha256').update(token, 'utf8').digest('hex');
}

/** True when a string could be one of our tokens (anything else is "not found" without a query). */
export function isLinkTokenShape(token: unknown): token is string {
  return typeof token === 'string' && TOKEN_SHAPE.test(token);
}
