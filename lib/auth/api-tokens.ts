import 'server-only';
import crypto from 'node:crypto';
import { Op, fn } from 'sequelize';
import { forbidden, HttpError, notFound } from '@/lib/http';
import { requestContext } from '@/lib/request-context';
import { ApiToken, Coop, Membership, User } from '@/models';
import type { CoopSettings } from '@/models/Coop';
import { can, type Action } from './policies';
import type { Actor } from './actor';

// Personal access tokens: `Authorization: Bearer tvt_…`. A token belongs to one co-op and acts
// with its creator's role there *now* (a demoted, suspended or removed creator takes the token's
// power with them); a read-only token may only read. The table keeps the SHA-256 of the token.

export const TOKEN_PREFIX = 'tvt_';
/** `tvt_` + 32 random bytes in base64url (43 characters). */
const TOKEN_SHAPE = /^tvt_[A-Za-z0-9_-]{43}$/;
/** Last use is recorded at most once an hour per token: the one write a read makes (DEVELOPERS.md). */
export const LAST_USED_EVERY_MS = 60 * 60 * 1000;

export const hashApiToken = (token: string) => crypto.createHash('sha256').update(token, 'utf8').digest('hex');

/** A fresh token, its hash and the prefix shown to recognise it. */
export function newApiToken(): { token: string; hash: string; prefix: string } {
  const token = TOKEN_PREFIX + crypto.randomBytes(32).toString('base64url');
  return { token, hash: hashApiToken(token), prefix: token.slice(0, 12) };
}

const invalidToken = () => new HttpError(401, 'The access token is missing, unknown or revoked.');

/** The bearer token of an Authorization header, or a 401 for any other kind of credentials. */
export function bearerToken(authorization: string): string {
  const m = /^Bearer\s+(\S+)\s*$/i.exec(authorization);
  if (!m || !TOKEN_SHAPE.test(m[1]!)) throw invalidToken();
  return m[1]!;
}

const READ_METHODS = new Set(['GET', 'HEAD']);

/**
 * requireMember for a request carrying `Authorization: Bearer`: 401 for an unknown or revoked
 * token (or one whose creator left the co-op), 404 for a co-op other than the token's, 403 for a
 * write with a read-only token, a suspended creator or a role that may not. Records last use at
 * most once an hour, and the token's id for the audit log of this request.
 */
export async function requireTokenMember(authorization: string, coopSlug: string, action: Action): Promise<Actor> {
  const hash = hashApiToken(bearerToken(authorization));
  const token = (await ApiToken.findOne({
    where: { tokenHash: hash, revokedAt: null },
    attributes: ['id', 'access', 'createdByUserId', 'lastUsedAt'],
    include: [
      {
        model: Coop,
        as: 'coop',
        required: true,
        attributes: ['id', 'slug', 'name', 'units', 'currency', 'timezone', 'settings'],
      },
      { model: User, as: 'createdBy', required: true, attributes: ['id', 'email', 'name'] },
    ],
  })) as (ApiToken & { coop: Coop; createdBy: User }) | null;
  if (!token) throw invalidToken();
  if (token.coop.slug !== String(coopSlug)) throw notFound('Co-op not found.');
  const m = await Membership.findOne({
    where: { coopId: token.coop.id, userId: token.createdByUserId },
    attributes: ['id', 'role', 'status'],
    raw: true,
  });
  if (!m) throw invalidToken();
  if (m.status !== 'active') throw forbidden("The membership of this token's creator is suspended.");
  const ctx = requestContext.getStore();
  // Outside a route handler the method is unknown: count it as a write.
  if (token.access === 'read' && !READ_METHODS.has(ctx?.method ?? 'POST'))
    throw forbidden('This access token is read-only.');
  if (!can(m.role, action)) throw forbidden();
  if (ctx) ctx.apiTokenId = token.id;
  if (!token.lastUsedAt || token.lastUsedAt.getTime() < Date.now() - LAST_USED_EVERY_MS) {
    await ApiToken.update(
      { lastUsedAt: fn('now') as unknown as Date },
      {
        where: {
          id: token.id,
          [Op.or]: [{ lastUsedAt: null }, { lastUsedAt: { [Op.lt]: new Date(Date.now() - LAST_USED_EVERY_MS) } }],
        },
      },
    );
  }
  const c = token.coop;
  return {
    user: { id: token.createdBy.id, email: token.createdBy.email, name: token.createdBy.name },
    role: m.role,
    membershipId: m.id,
    coop: {
      id: c.id,
      slug: c.slug,
      name: c.name,
      units: c.units,
      currency: c.currency,
      timezone: c.timezone,
      settings: (c.settings ?? {}) as CoopSettings,
    },
    apiTokenId: token.id,
  };
}
