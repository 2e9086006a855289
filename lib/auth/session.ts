import 'server-only';
import { cache } from 'react';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/lib/db';
import { forbidden, HttpError, notFound, unauthorized } from '@/lib/http';
import type { Role } from '@/lib/auth/roles';
import type { UnitSystem, CoopSettings } from '@/models/Coop';
import { readSessionCookie } from './jwt';
import { can, type Action } from './policies';

export interface SessionUser {
  id: number;
  email: string;
  name: string;
}

/** The acting member: who, in which co-op, with which role. Passed first to every lib/ service. */
export interface Actor {
  user: SessionUser;
  coop: { id: number; slug: string; name: string; units: UnitSystem; currency: string; timezone: string; settings: CoopSettings };
  role: Role;
  membershipId: number;
}

/**
 * The signed-in user, re-read from the database on every request: a JWT whose session
 * version no longer matches (password changed, signed out everywhere) counts as signed out.
 */
const readSession = cache(readSessionCookie);

export const getSessionUser = cache(async (): Promise<SessionUser | null> => {
  const session = await readSession();
  if (!session) return null;
  const rows = await sequelize.query<{ id: number; email: string; name: string; session_version: number }>(
    'SELECT id, email, name, session_version FROM users WHERE id = :uid',
    { replacements: { uid: session.uid }, type: QueryTypes.SELECT },
  );
  const u = rows[0];
  if (!u || session.sv !== u.session_version) return null;
  return { id: u.id, email: u.email, name: u.name };
});

/** The signed-in user or a 401. */
export async function requireUser(): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) throw unauthorized();
  return user;
}

/** Memberships of a user, active and suspended, for the co-op switcher and profile. */
export const listMyCoops = cache(async (userId: number) => {
  return sequelize.query<{ slug: string; name: string; role: Role; status: string }>(
    `SELECT c.slug, c.name, m.role, m.status FROM memberships m JOIN coops c ON c.id = m.coop_id
     WHERE m.user_id = :userId ORDER BY c.name`,
    { replacements: { userId }, type: QueryTypes.SELECT },
  );
});

/** The user and their membership in the co-op of the URL, in one query (null membership fields when not a member). */
const loadActor = cache(async (userId: number, coopSlug: string) => {
  const rows = await sequelize.query<{
    user_id: number; email: string; user_name: string; session_version: number;
    membership_id: number | null; role: Role; status: string; coop_id: number; slug: string; name: string;
    units: UnitSystem; currency: string; timezone: string; settings: CoopSettings;
  }>(
    `SELECT u.id AS user_id, u.email, u.name AS user_name, u.session_version,
            m.id AS membership_id, m.role, m.status, c.id AS coop_id, c.slug, c.name, c.units, c.currency, c.timezone, c.settings
     FROM users u
     LEFT JOIN (memberships m JOIN coops c ON c.id = m.coop_id AND c.slug = :coopSlug) ON m.user_id = u.id
     WHERE u.id = :userId`,
    { replacements: { userId, coopSlug }, type: QueryTypes.SELECT },
  );
  return rows[0] ?? null;
});

/**
 * The one authorization entry point: session → membership in the co-op of the URL → may this
 * role do this action. 401 without a session; 404 when the user is not in that co-op (its
 * existence is not revealed); 403 when suspended or the role may not.
 */
export async function requireMember(coopSlug: string, action: Action): Promise<Actor> {
  const session = await readSession();
  if (!session) throw unauthorized();
  const row = await loadActor(session.uid, String(coopSlug).slice(0, 60));
  if (!row || row.session_version !== session.sv) throw unauthorized();
  const user: SessionUser = { id: row.user_id, email: row.email, name: row.user_name };
  if (row.membership_id === null) throw notFound('Co-op not found.');
  if (row.status !== 'active') throw forbidden('Your membership in this co-op is suspended.');
  if (!can(row.role, action)) throw forbidden();
  return {
    user,
    role: row.role,
    membershipId: row.membership_id,
    coop: { id: row.coop_id, slug: row.slug, name: row.name, units: row.units, currency: row.currency, timezone: row.timezone, settings: row.settings ?? {} },
  };
}

/** For pages: the actor or null instead of throwing on 401/403/404. */
export async function findActor(coopSlug: string, action: Action = 'coop:read'): Promise<Actor | HttpError> {
  try {
    return await requireMember(coopSlug, action);
  } catch (e) {
    if (e instanceof HttpError) return e;
    throw e;
  }
}
