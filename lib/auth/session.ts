import 'server-only';
import { getToken } from 'next-auth/jwt';
import { headers } from 'next/headers';
import { NextRequest } from 'next/server';
import { cache } from 'react';
import type { InferAttributes } from 'sequelize';
import { forbidden, HttpError, notFound, unauthorized } from '@/lib/http';
import type { Role } from '@/lib/auth/roles';
import { Coop, Membership, User } from '@/models';
import type { CoopSettings } from '@/models/Coop';
import type { MembershipStatus } from '@/models/Membership';
import { can, type Action } from './policies';

export type SessionUser = Pick<InferAttributes<User>, 'id' | 'email' | 'name'>;

type ActorCoop = Pick<InferAttributes<Coop>, 'id' | 'slug' | 'name' | 'units' | 'currency' | 'timezone' | 'settings'>;

/** The acting member: who, in which co-op, with which role. Passed first to every lib/ service. */
export interface Actor {
  user: SessionUser;
  coop: ActorCoop;
  role: Role;
  membershipId: number;
}

/** What the session cookie says: the user id and the session version it was issued with. */
interface SessionClaims {
  uid: number;
  sv: number;
}

/**
 * The claims of next-auth's session cookie, or null. next-auth's own `getToken` finds the cookie
 * (its name, split into chunks when large) in a request and decrypts it; App Router hands us the
 * incoming Cookie header, so it gets a request carrying just that header (no Authorization
 * header: a session is a cookie here, nothing else).
 */
const readSession = cache(async (): Promise<SessionClaims | null> => {
  const cookie = (await headers()).get('cookie');
  if (!cookie) return null;
  const token = await getToken({ req: new NextRequest('http://localhost/', { headers: { cookie } }) });
  const uid = Number(token?.uid);
  const sv = Number(token?.sv);
  return Number.isInteger(uid) && uid > 0 && Number.isInteger(sv) ? { uid, sv } : null;
});

const USER_ATTRIBUTES = ['id', 'email', 'name', 'sessionVersion'] as const;

/** The user's row when the cookie's session version is still theirs (a password change or sign-out everywhere bumps it). */
function current<U extends Pick<InferAttributes<User>, 'sessionVersion'>>(user: U | null, session: SessionClaims): U | null {
  return user && user.sessionVersion === session.sv ? user : null;
}

/**
 * The signed-in user, re-read from the database on every request: a cookie whose session
 * version no longer matches (password changed, signed out everywhere) counts as signed out.
 */
export const getSessionUser = cache(async (): Promise<SessionUser | null> => {
  const session = await readSession();
  if (!session) return null;
  const user = current(await User.findByPk(session.uid, { attributes: [...USER_ATTRIBUTES], raw: true }), session);
  return user && { id: user.id, email: user.email, name: user.name };
});

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
  })) as unknown as (Pick<InferAttributes<Membership>, 'role' | 'status'> & { coop: Pick<InferAttributes<Coop>, 'slug' | 'name'> })[];
  return rows.map((m) => ({ slug: m.coop.slug, name: m.coop.name, role: m.role, status: m.status }));
});

/**
 * The user with their session version and their membership in the co-op of the URL, as one row
 * (raw, nested): `memberships` is the membership in that co-op, all nulls when there is none.
 */
type SessionRow = Pick<InferAttributes<User>, (typeof USER_ATTRIBUTES)[number]> & {
  memberships: { id: number | null; role: Role; status: MembershipStatus; coop: ActorCoop };
};

/** One query: the user, their session version, and their membership in the co-op whose slug is given. */
const loadSessionRow = cache(async (userId: number, coopSlug: string): Promise<SessionRow | null> =>
  (await User.findByPk(userId, {
    attributes: [...USER_ATTRIBUTES],
    include: [{
      model: Membership,
      as: 'memberships',
      required: false,
      attributes: ['id', 'role', 'status'],
      include: [{
        model: Coop,
        as: 'coop',
        required: true,
        where: { slug: coopSlug },
        attributes: ['id', 'slug', 'name', 'units', 'currency', 'timezone', 'settings'],
      }],
    }],
    raw: true,
    nest: true,
  })) as unknown as SessionRow | null,
);

/**
 * The one authorization entry point: session → membership in the co-op of the URL → may this
 * role do this action. 401 without a session (or with one ended by a password change or sign-out
 * everywhere); 404 when the user is not in that co-op (its existence is not revealed); 403 when
 * suspended or the role may not.
 */
export async function requireMember(coopSlug: string, action: Action): Promise<Actor> {
  const session = await readSession();
  if (!session) throw unauthorized();
  const row = current(await loadSessionRow(session.uid, String(coopSlug).slice(0, 60)), session);
  if (!row) throw unauthorized();
  const m = row.memberships;
  if (m.id === null) throw notFound('Co-op not found.');
  if (m.status !== 'active') throw forbidden('Your membership in this co-op is suspended.');
  if (!can(m.role, action)) throw forbidden();
  return {
    user: { id: row.id, email: row.email, name: row.name },
    role: m.role,
    membershipId: m.id,
    coop: { ...m.coop, settings: (m.coop.settings ?? {}) as CoopSettings },
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
