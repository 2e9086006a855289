import 'server-only';
import crypto from 'node:crypto';
import { fn, Op, type Transaction } from 'sequelize';
import { Session } from '@/models';

/**
 * Server-side sessions. The session cookie (next-auth's encrypted JWT) carries a random session
 * id; the `sessions` row keeps its SHA-256. A session counts while its row is
 *  - not revoked: sign-out revokes this row, sign-out everywhere / a password change / a reset
 *    revoke all of the person's rows;
 *  - younger than SESSION_MAX_AGE_DAYS (absolute lifetime, from sign-in);
 *  - not idle: last seen less than SESSION_IDLE_DAYS ago. "Seen" is recorded at sign-in and on
 *    writes through `touchSession` (at most once an hour); reads never write, so a session used
 *    only for reading for a week must sign in again.
 * The per-request check is one bound statement, `sessionRow` in lib/auth/queries.ts.
 */
export const SESSION_MAX_AGE_DAYS = 30;
export const SESSION_IDLE_DAYS = 7;
const TOUCH_EVERY_MS = 60 * 60 * 1000;

export const hashSessionId = (sid: string) => crypto.createHash('sha256').update(sid).digest('hex');

/** A readable summary of a User-Agent header (for a future "your sessions" list), at most 120 characters. */
function summarizeUserAgent(ua: string | null | undefined): string {
  const clean = String(ua ?? '').replace(/[^\x20-\x7e]/g, '');
  const browser = clean.match(/(Firefox|Edg|OPR|Chrome|Safari)\/[\d.]+/)?.[0];
  const os = clean.match(/Windows NT [\d.]+|Mac OS X [\d_]+|Android [\d.]+|iPhone OS [\d_]+|Linux/)?.[0];
  return (browser || os ? [browser, os].filter(Boolean).join(' on ') : clean).slice(0, 120);
}

/**
 * Starts a session for the user; returns the session id for the cookie (only its hash is stored).
 * The user's sessions that ended more than SESSION_MAX_AGE_DAYS ago are deleted on the way.
 */
export async function startSession(userId: number, userAgent: string | null | undefined): Promise<string> {
  const sid = crypto.randomBytes(32).toString('base64url');
  const longAgo = new Date(Date.now() - SESSION_MAX_AGE_DAYS * 24 * 60 * 60 * 1000);
  await Session.destroy({
    where: { userId, [Op.or]: [{ expiresAt: { [Op.lt]: longAgo } }, { revokedAt: { [Op.lt]: longAgo } }] },
  });
  await Session.create({
    tokenHash: hashSessionId(sid),
    userId,
    expiresAt: new Date(Date.now() + SESSION_MAX_AGE_DAYS * 24 * 60 * 60 * 1000),
    userAgent: summarizeUserAgent(userAgent),
  });
  return sid;
}

/** Revokes one session (sign-out). */
export async function revokeSession(sid: string): Promise<void> {
  await Session.update(
    { revokedAt: fn('now') as unknown as Date },
    { where: { tokenHash: hashSessionId(sid), revokedAt: null } },
  );
}

/** Revokes every session of the user (sign-out everywhere, password change or reset). */
export async function revokeAllSessions(userId: number, transaction?: Transaction): Promise<void> {
  await Session.update(
    { revokedAt: fn('now') as unknown as Date },
    { where: { userId, revokedAt: null }, transaction },
  );
}

/** Records that the session was used for a write (at most once an hour per session). */
export async function touchSession(sid: string): Promise<void> {
  await Session.update(
    { lastSeenAt: fn('now') as unknown as Date },
    {
      where: {
        tokenHash: hashSessionId(sid),
        revokedAt: null,
        lastSeenAt: { [Op.lt]: new Date(Date.now() - TOUCH_EVERY_MS) },
      },
    },
  );
}
