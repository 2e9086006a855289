import 'server-only';
import type { memberSchema, removedSchema } from '@/lib/api/dto/members';
import {
  col,
  fn,
  ForeignKeyConstraintError,
  literal,
  Op,
  type InferAttributes,
  type OrderItem,
  type Transaction,
  type WhereOptions,
} from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { ROLES } from '@/lib/auth/roles';
import { inTransaction } from '@/lib/db';
import { conflict, notFound } from '@/lib/http';
import type { membershipUpdateSchema } from '@/lib/validation/auth';
import type { MemberListQuery } from '@/lib/validation/members';
import { Coop, Membership, type User } from '@/models';
import type { MembershipStatus } from '@/models/Membership';

export type { MembershipStatus };

/** One row of the members table. */
export type MemberDto = z.infer<typeof memberSchema>;

export interface MemberPage {
  rows: MemberDto[];
  page: number;
  pageSize: number;
  total: number;
  /** Active admins in the co-op (the last one cannot be demoted, suspended or removed). */
  activeAdmins: number;
}

/** A membership with its person's name and e-mail (the include every read here uses). */
type MemberWithUser = Membership & { user: Pick<InferAttributes<User>, 'name' | 'email'> };

const MEMBER_ATTRIBUTES = ['id', 'userId', 'role', 'status', 'joinedAt'];

/** Roles in the order the table sorts them: most powerful first (ROLES' order; constants, no input). */
const ROLE_RANK = literal(`ARRAY[${ROLES.map((r) => `'${r}'`).join(',')}]::varchar[]`);

const SORT: Record<MemberListQuery['sort'], (dir: 'ASC' | 'DESC') => OrderItem> = {
  name: (dir) => [fn('lower', col('user.name')), dir],
  email: (dir) => [fn('lower', col('user.email')), dir],
  role: (dir) => [fn('array_position', ROLE_RANK, col('Membership.role')), dir],
  status: (dir) => ['status', dir],
  joined: (dir) => ['joinedAt', dir],
};

const toDto = (actor: Actor, m: MemberWithUser): MemberDto => ({
  id: m.id,
  userId: m.userId,
  name: m.user.name,
  email: m.user.email,
  role: m.role,
  status: m.status,
  joinedAt: m.joinedAt.toISOString(),
  isYou: m.userId === actor.user.id,
});

/** Escapes LIKE wildcards so a search for "50%" means the characters, not a pattern (backslash is PostgreSQL's LIKE escape). */
const likeTerm = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/**
 * The co-op's members, filtered by role, status and a search over name and e-mail, sorted and
 * paged by the database.
 */
export async function listMembers(actor: Actor, query: MemberListQuery): Promise<MemberPage> {
  const where: WhereOptions<Membership> = {
    coopId: actor.coop.id,
    ...(query.role ? { role: query.role } : {}),
    ...(query.status ? { status: query.status } : {}),
  };
  const term = query.q ? likeTerm(query.q) : null;
  const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
  const [{ rows, count }, activeAdmins] = await Promise.all([
    Membership.findAndCountAll({
      attributes: MEMBER_ATTRIBUTES,
      where,
      include: [
        {
          association: 'user',
          attributes: ['name', 'email'],
          required: true,
          ...(term ? { where: { [Op.or]: [{ name: { [Op.iLike]: term } }, { email: { [Op.iLike]: term } }] } } : {}),
        },
      ],
      order: [SORT[query.sort](dir), ['id', dir]],
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
    }),
    Membership.count({ where: { coopId: actor.coop.id, role: 'admin', status: 'active' } }),
  ]);
  return {
    rows: rows.map((r) => toDto(actor, r as MemberWithUser)),
    page: query.page,
    pageSize: query.pageSize,
    total: count,
    activeAdmins,
  };
}

/**
 * Locks the co-op's row for the rest of the transaction so membership changes in one co-op
 * run one after another: two admins demoting each other at the same moment cannot both
 * succeed and leave the co-op without an admin. FOR NO KEY UPDATE does not block inserts
 * elsewhere that merely reference the co-op.
 */
async function lockCoop(coopId: number, transaction: Transaction) {
  await Coop.findByPk(coopId, { attributes: ['id'], lock: transaction.LOCK.NO_KEY_UPDATE, transaction });
}

/** The membership (id AND co-op in one query) locked for update, or a 404. */
async function lockMembership(actor: Actor, membershipId: number, transaction: Transaction): Promise<MemberWithUser> {
  const row = await Membership.findOne({
    attributes: MEMBER_ATTRIBUTES,
    where: { id: membershipId, coopId: actor.coop.id },
    include: [{ association: 'user', attributes: ['name', 'email'], required: true }],
    lock: { level: transaction.LOCK.UPDATE, of: Membership },
    transaction,
  });
  if (!row) throw notFound('That member is not in this co-op.');
  return row as MemberWithUser;
}

/** Active admins of the co-op other than this membership (read under the co-op lock). */
async function otherActiveAdmins(coopId: number, membershipId: number, transaction: Transaction): Promise<number> {
  return Membership.count({
    where: { coopId, role: 'admin', status: 'active', id: { [Op.ne]: membershipId } },
    transaction,
  });
}

const LAST_ADMIN = 'A co-op needs at least one active admin. Make another member an admin first.';

/**
 * Changes a member's role and/or status (suspend, reinstate). The last active admin of the
 * co-op cannot be demoted or suspended (409). Takes effect on the member's next request, as
 * every request re-reads the membership.
 */
export async function updateMembership(
  actor: Actor,
  membershipId: number,
  input: z.infer<typeof membershipUpdateSchema>,
): Promise<MemberDto> {
  return inTransaction(async (transaction) => {
    await lockCoop(actor.coop.id, transaction);
    const before = await lockMembership(actor, membershipId, transaction);
    const was = { role: before.role, status: before.status };
    const role = input.role ?? was.role;
    const status = input.status ?? was.status;
    if (role === was.role && status === was.status) return toDto(actor, before);
    const losesAdmin = was.role === 'admin' && was.status === 'active' && (role !== 'admin' || status !== 'active');
    if (losesAdmin && (await otherActiveAdmins(actor.coop.id, membershipId, transaction)) === 0)
      throw conflict(LAST_ADMIN);
    await Membership.update({ role, status }, { where: { id: membershipId, coopId: actor.coop.id }, transaction });
    const action =
      role !== was.role && status !== was.status
        ? 'membership.update'
        : role !== was.role
          ? 'membership.role-change'
          : status === 'suspended'
            ? 'membership.suspend'
            : 'membership.reinstate';
    const who = { userId: before.userId, email: before.user.email };
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action,
        entityType: 'membership',
        entityId: membershipId,
        before: { ...who, ...was },
        after: { ...who, role, status },
      },
      transaction,
    );
    return { ...toDto(actor, before), role, status };
  });
}

/**
 * Removes a member from the co-op (their account and other co-ops stay). The last active admin
 * cannot be removed (409); a member whose records other tables still point at is suspended
 * instead of removed (409 says so).
 */
export async function removeMembership(actor: Actor, membershipId: number): Promise<z.infer<typeof removedSchema>> {
  try {
    return await inTransaction(async (transaction) => {
      await lockCoop(actor.coop.id, transaction);
      const before = await lockMembership(actor, membershipId, transaction);
      if (
        before.role === 'admin' &&
        before.status === 'active' &&
        (await otherActiveAdmins(actor.coop.id, membershipId, transaction)) === 0
      ) {
        throw conflict(LAST_ADMIN);
      }
      await Membership.destroy({ where: { id: membershipId, coopId: actor.coop.id }, transaction });
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'membership.remove',
          entityType: 'membership',
          entityId: membershipId,
          before: {
            userId: before.userId,
            email: before.user.email,
            name: before.user.name,
            role: before.role,
            status: before.status,
          },
          after: null,
        },
        transaction,
      );
      return { removed: true as const, id: membershipId };
    });
  } catch (e) {
    if (e instanceof ForeignKeyConstraintError) {
      throw conflict(
        'This member has records in the co-op (such as draws or invoices), so they cannot be removed. Suspend them instead.',
      );
    }
    throw e;
  }
}
