import 'server-only';
import { getToken } from 'next-auth/jwt';
import { headers } from 'next/headers';
import { NextRequest } from 'next/server';
import { cache } from 'react';
import type { InferAttributes } from 'sequelize';
import { forbidden, HttpError, notFound, unauthorized } from '@/lib/http';
import type { Role } from '@/lib/auth/roles';
import { Coop, Membership } from '@/models';
import type { CoopSettings } from '@/models/Coop';
import type { MembershipStatus } from '@/models/Membership';
import { can, type Action } from './policies';
import { requireTokenMember } from './api-tokens';
import { cookieDecodeMemo } from './cookie-memo';
import { sessionRow } from './queries';
import { hashSessionId, SESSION_IDLE_DAYS, touchSession } from './sessions';

export type { Actor, SessionUser } from './actor';
import type { Actor, SessionUser } from './actor';

/** What the session cookie says: the user id and the server-side session's id (lib/auth/sessions.ts). */
interface SessionClaims {
  uid: number;
  sid: string;
}

/** next-auth's `decode`, remembering each cookie's payload in this process (lib/auth/cookie-memo.ts). */
const decodeSessionCookie = cookieDecodeMemo();

/**
 * The claims of next-auth's session cookie, or null. next-auth's own `getToken` finds the cookie
 * (its name, split into chunks when large) in a request and decrypts it (once per cookie string
 * per process: `decodeSessionCookie`); App Router hands us the incoming Cookie header, so it gets
 * a request carrying just that header (no Authorization header: a session is a cookie here,
 * nothing else). A request that carries an Authorization header is never authenticated by a
 * cookie: it is a token caller (requireMember), or no one.
 */
const readSession = cache(async (): Promise<SessionClaims | null> => {
  const h = await headers();
  if (h.has('authorization')) return null;
  const cookie = h.get('cookie');
  if (!cookie) return null;
  const token = await getToken({
    req: new NextRequest('http://localhost/', { headers: { cookie } }),
    decode: decodeSessionCookie,
  });
  const uid = Number(token?.uid);
  const sid = token?.sid;
  return Number.isInteger(uid) && uid > 0 && typeof sid === 'string' && sid.length > 0 && sid.length <= 64
    ? { uid, sid }
    : null;
});

/**
 * The signed-in user, re-read from the database on every request with the cookie's session row
 * in the same query: a session that was signed out, revoked, expired or idle counts as signed out.
 */
export const getSessionUser = cache(async (): Promise<SessionUser | null> => {
  const session = await readSession();
  if (!session) return null;
  const user = await loadSessionRow(session, null);
  return user && { id: user.id, email: user.email, name: user.name };
});

/**
 * Records that the current session made a write (it then stays alive past the idle timeout);
 * call after a successful write. No-op without a session.
 */
export async function touchCurrentSession(): Promise<void> {
  const session = await readSession();
  if (session) await touchSession(session.sid);
}

/** The signed-in user or a 401. */
export async function requireUser(): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) throw unauthorized();
  return user;
}

export interface MyCoop {
  slug: string;
  name: string;
  role: Role;
  status: MembershipStatus;
}

/** Memberships of a user, active and suspended, for the co-op switcher (on every page) and profile. */
export const listMyCoops = cache(async (userId: number): Promise<MyCoop[]> => {
  const rows = (await Membership.findAll({
    where: { userId },
    attributes: ['role', 'status'],
    include: [{ model: Coop, as: 'coop', attributes: ['slug', 'name'], required: true }],
    order: [[{ model: Coop, as: 'coop' }, 'name', 'ASC']],
    raw: true,
    nest: true,
  })) as unknown as (Pick<InferAttributes<Membership>, 'role' | 'status'> & {
    coop: Pick<InferAttributes<Coop>, 'slug' | 'name'>;
  })[];
  return rows.map((m) => ({ slug: m.coop.slug, name: m.coop.name, role: m.role, status: m.status }));
});

/** The user with their live session and their membership in the co-op of the URL (lib/auth/queries.ts). */
const loadSessionRow = cache((session: SessionClaims, coopSlug: string | null) =>
  sessionRow({ userId: session.uid, tokenHash: hashSessionId(session.sid), idleDays: SESSION_IDLE_DAYS, coopSlug }),
);

/**
 * The one authorization entry point: session → membership in the co-op of the URL → may this
 * role do this action. 401 without a session (or with one signed out, revoked, expired or idle);
 * 404 when the user is not in that co-op (its existence is not revealed); 403 when suspended or
 * the role may not. With `Authorization: Bearer <token>` the token is the only credential
 * (lib/auth/api-tokens.ts), whatever cookies the request carries.
 */
export async function requireMember(coopSlug: string, action: Action): Promise<Actor> {
  const authorization = (await headers()).get('authorization');
  if (authorization !== null) return requireTokenMember(authorization, String(coopSlug).slice(0, 60), action);
  const session = await readSession();
  if (!session) throw unauthorized();
  const row = await loadSessionRow(session, String(coopSlug).slice(0, 60));
  if (!row) throw unauthorized();
  if (row.membershipId === null || !row.role || !row.coop) throw notFound('Co-op not found.');
  if (row.status !== 'active') throw forbidden('Your membership in this co-op is suspended.');
  if (!can(row.role, action)) throw forbidden();
  return {
    user: { id: row.id, email: row.email, name: row.name },
    role: row.role,
    membershipId: row.membershipId,
    coop: { ...row.coop, settings: (row.coop.settings ?? {}) as CoopSettings },
  };
}

/** For pages: the actor or the HttpError (401/403/404) instead of throwing it. */
export async function findActor(coopSlug: string, action: Action = 'coop:read'): Promise<Actor | HttpError> {
  try {
    return await requireMember(coopSlug, action);
  } catch (e) {
    if (e instanceof HttpError) return e;
    throw e;
  }
}
