import 'server-only';
import { ForeignKeyConstraintError, QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import type { Role } from '@/lib/auth/roles';
import { conflict, notFound } from '@/lib/http';
import type { membershipUpdateSchema } from '@/lib/validation/auth';
import type { MemberListQuery } from '@/lib/validation/members';
import { sequelize } from '@/models';

export type MembershipStatus = 'active' | 'suspended';

/** One row of the members table. */
export interface MemberDto {
  id: number;
  userId: number;
  name: string;
  email: string;
  role: Role;
  status: MembershipStatus;
  joinedAt: string;
  /** True for the row of the admin looking at the table. */
  isYou: boolean;
}

export interface MemberPage {
  rows: MemberDto[];
  page: number;
  pageSize: number;
  total: number;
  /** Active admins in the co-op (the last one cannot be demoted, suspended or removed). */
  activeAdmins: number;
}

type Row = { id: number; user_id: number; name: string; email: string; role: Role; status: MembershipStatus; joined_at: Date | string };

const SORT_SQL: Record<MemberListQuery['sort'], string> = {
  name: 'lower(u.name)',
  email: 'lower(u.email)',
  role: "array_position(ARRAY['admin','treasurer','brewer','member']::varchar[], m.role)",
  status: 'm.status',
  joined: 'm.joined_at',
};

const toDto = (actor: Actor, r: Row): MemberDto => ({
  id: r.id,
  userId: r.user_id,
  name: r.name,
  email: r.email,
  role: r.role,
  status: r.status,
  joinedAt: new Date(r.joined_at).toISOString(),
  isYou: r.user_id === actor.user.id,
});

/** Escapes LIKE wildcards so a search for "50%" means the characters, not a pattern. */
const likeTerm = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/**
 * The co-op's members, filtered by role, status and a search over name and e-mail, sorted and
 * paged by the database.
 */
export async function listMembers(actor: Actor, query: MemberListQuery): Promise<MemberPage> {
  const where = ['m.coop_id = :coopId'];
  const replacements: Record<string, unknown> = { coopId: actor.coop.id, limit: query.pageSize, offset: (query.page - 1) * query.pageSize };
  if (query.role) {
    where.push('m.role = :role');
    replacements.role = query.role;
  }
  if (query.status) {
    where.push('m.status = :status');
    replacements.status = query.status;
  }
  if (query.q) {
    where.push("(u.name ILIKE :q ESCAPE '\\' OR u.email ILIKE :q ESCAPE '\\')");
    replacements.q = likeTerm(query.q);
  }
  const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
  const [rows, counts] = await Promise.all([
    sequelize.query<Row & { total: string }>(
      `SELECT m.id, m.user_id, u.name, u.email, m.role, m.status, m.joined_at, count(*) OVER () AS total
       FROM memberships m JOIN users u ON u.id = m.user_id
       WHERE ${where.join(' AND ')}
       ORDER BY ${SORT_SQL[query.sort]} ${dir}, m.id ${dir}
       LIMIT :limit OFFSET :offset`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ admins: string; members: string }>(
      `SELECT count(*) FILTER (WHERE role = 'admin' AND status = 'active') AS admins, count(*) AS members
       FROM memberships WHERE coop_id = :coopId`,
      { replacements: { coopId: actor.coop.id }, type: QueryTypes.SELECT },
    ),
  ]);
  // A page past the end has no rows to carry the window count: count the filter alone then.
  let total = rows[0] ? Number(rows[0].total) : 0;
  if (!rows[0] && query.page > 1) {
    const [c] = await sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM memberships m JOIN users u ON u.id = m.user_id WHERE ${where.join(' AND ')}`,
      { replacements, type: QueryTypes.SELECT },
    );
    total = Number(c?.n ?? 0);
  }
  return {
    rows: rows.map((r) => toDto(actor, r)),
    page: query.page,
    pageSize: query.pageSize,
    total,
    activeAdmins: Number(counts[0]?.admins ?? 0),
  };
}

/**
 * Locks the co-op's row for the rest of the transaction so membership changes in one co-op
 * run one after another: two admins demoting each other at the same moment cannot both
 * succeed and leave the co-op without an admin. FOR NO KEY UPDATE does not block inserts
 * elsewhere that merely reference the co-op.
 */
async function lockCoop(coopId: number, transaction: Transaction) {
  await sequelize.query('SELECT id FROM coops WHERE id = :coopId FOR NO KEY UPDATE', { replacements: { coopId }, transaction, type: QueryTypes.SELECT });
}

/** The membership (id AND co-op in one query) locked for update, or a 404. */
async function lockMembership(actor: Actor, membershipId: number, transaction: Transaction): Promise<Row> {
  const [row] = await sequelize.query<Row>(
    `SELECT m.id, m.user_id, u.name, u.email, m.role, m.status, m.joined_at
     FROM memberships m JOIN users u ON u.id = m.user_id
     WHERE m.id = :membershipId AND m.coop_id = :coopId
     FOR UPDATE OF m`,
    { replacements: { membershipId, coopId: actor.coop.id }, transaction, type: QueryTypes.SELECT },
  );
  if (!row) throw notFound('That member is not in this co-op.');
  return row;
}

async function otherActiveAdmins(coopId: number, membershipId: number, transaction: Transaction): Promise<number> {
  const [r] = await sequelize.query<{ n: string }>(
    `SELECT count(*) AS n FROM memberships WHERE coop_id = :coopId AND role = 'admin' AND status = 'active' AND id <> :membershipId`,
    { replacements: { coopId, membershipId }, transaction, type: QueryTypes.SELECT },
  );
  return Number(r?.n ?? 0);
}

const LAST_ADMIN = 'A co-op needs at least one active admin. Make another member an admin first.';

/**
 * Changes a member's role and/or status (suspend, reinstate). The last active admin of the
 * co-op cannot be demoted or suspended (409). Takes effect on the member's next request, as
 * every request re-reads the membership.
 */
export async function updateMembership(actor: Actor, membershipId: number, input: z.infer<typeof membershipUpdateSchema>): Promise<MemberDto> {
  return sequelize.transaction(async (transaction) => {
    await lockCoop(actor.coop.id, transaction);
    const before = await lockMembership(actor, membershipId, transaction);
    const role = input.role ?? before.role;
    const status = input.status ?? before.status;
    if (role === before.role && status === before.status) return toDto(actor, before);
    const losesAdmin = before.role === 'admin' && before.status === 'active' && (role !== 'admin' || status !== 'active');
    if (losesAdmin && (await otherActiveAdmins(actor.coop.id, membershipId, transaction)) === 0) throw conflict(LAST_ADMIN);
    await sequelize.query(
      `UPDATE memberships SET role = :role, status = :status, updated_at = now() WHERE id = :membershipId AND coop_id = :coopId`,
      { replacements: { role, status, membershipId, coopId: actor.coop.id }, transaction },
    );
    const action = role !== before.role && status !== before.status ? 'membership.update' : role !== before.role ? 'membership.role-change' : status === 'suspended' ? 'membership.suspend' : 'membership.reinstate';
    await audit(
      {
        coopId: actor.coop.id, actorUserId: actor.user.id, action, entityType: 'membership', entityId: membershipId,
        before: { userId: before.user_id, email: before.email, role: before.role, status: before.status },
        after: { userId: before.user_id, email: before.email, role, status },
      },
      transaction,
    );
    return toDto(actor, { ...before, role, status });
  });
}

/**
 * Removes a member from the co-op (their account and other co-ops stay). The last active admin
 * cannot be removed (409); a member whose records other tables still point at is suspended
 * instead of removed (409 says so).
 */
export async function removeMembership(actor: Actor, membershipId: number): Promise<{ removed: true; id: number }> {
  try {
    return await sequelize.transaction(async (transaction) => {
      await lockCoop(actor.coop.id, transaction);
      const before = await lockMembership(actor, membershipId, transaction);
      if (before.role === 'admin' && before.status === 'active' && (await otherActiveAdmins(actor.coop.id, membershipId, transaction)) === 0) {
        throw conflict(LAST_ADMIN);
      }
      await sequelize.query('DELETE FROM memberships WHERE id = :membershipId AND coop_id = :coopId', {
        replacements: { membershipId, coopId: actor.coop.id },
        transaction,
      });
      await audit(
        {
          coopId: actor.coop.id, actorUserId: actor.user.id, action: 'membership.remove', entityType: 'membership', entityId: membershipId,
          before: { userId: before.user_id, email: before.email, name: before.name, role: before.role, status: before.status },
          after: null,
        },
        transaction,
      );
      return { removed: true as const, id: membershipId };
    });
  } catch (e) {
    if (e instanceof ForeignKeyConstraintError) {
      throw conflict('This member has records in the co-op (such as draws or invoices), so they cannot be removed. Suspend them instead.');
    }
    throw e;
  }
}

/** A numeric id from the URL (`/members/12`); anything else is a 404 (the one parser, in lib/validation). */
export { idParam } from '@/lib/validation/id-param';
