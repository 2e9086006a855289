import 'server-only';
import { QueryTypes, type InferAttributes } from 'sequelize';
import type { Role } from '@/lib/auth/roles';
import { sequelize } from '@/lib/db';
import type { Coop, User } from '@/models';
import type { MembershipStatus } from '@/models/Membership';

// The statement of auth that a model call says too slowly: the session check runs on every
// signed-in request, and building its three-table include took Sequelize about 2 ms of CPU per
// request — more than everything else a small API request does (bench/README.md). Values bound.

/** The user, and their membership in the co-op asked for (membership fields null when none). */
export interface SessionRow extends Pick<InferAttributes<User>, 'id' | 'email' | 'name'> {
  membershipId: number | null;
  role: Role | null;
  status: MembershipStatus | null;
  coop: Pick<InferAttributes<Coop>, 'id' | 'slug' | 'name' | 'units' | 'currency' | 'timezone' | 'settings'> | null;
}

/**
 * One statement: the user, required to hold the live session whose token hash is given (not
 * revoked, not expired, seen within `idleDays`), with their membership in the co-op whose slug is
 * given (none for `coopSlug` null). No row: no user or no live session.
 */
export async function sessionRow(p: {
  userId: number;
  tokenHash: string;
  idleDays: number;
  coopSlug: string | null;
}): Promise<SessionRow | null> {
  const [row] = await sequelize.query<SessionRow>(
    `SELECT u.id, u.email, u.name, m.id AS "membershipId", m.role, m.status,
            CASE WHEN c.id IS NULL THEN NULL ELSE json_build_object('id', c.id, 'slug', c.slug, 'name', c.name, 'units', c.units,
              'currency', c.currency, 'timezone', c.timezone, 'settings', c.settings) END AS coop
     FROM users u
     JOIN sessions s ON s.user_id = u.id AND s.token_hash = $tokenHash AND s.revoked_at IS NULL
       AND s.expires_at > now() AND s.last_seen_at > now() - make_interval(days => $idleDays::int)
     LEFT JOIN (memberships m JOIN coops c ON c.id = m.coop_id AND c.slug = $coopSlug::text) ON m.user_id = u.id
     WHERE u.id = $userId
     LIMIT 1`,
    { bind: p, type: QueryTypes.SELECT },
  );
  return row ?? null;
}
