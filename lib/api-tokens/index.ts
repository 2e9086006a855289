import 'server-only';
import type { apiTokenSchema } from '@/lib/api/dto/members';
import type { z } from 'zod';
import { fn } from 'sequelize';
import { audit } from '@/lib/audit';
import { newApiToken } from '@/lib/auth/api-tokens';
import { requireCan } from '@/lib/auth/require';
import type { Actor } from '@/lib/auth/session';
import { inTransaction } from '@/lib/db';
import { conflict, forbidden, notFound } from '@/lib/http';
import type { apiTokenCreateSchema } from '@/lib/validation/api-tokens';
import { ApiToken, User } from '@/models';

// Managing a co-op's personal access tokens (admins and treasurers, from a signed-in session: a
// token cannot mint or revoke tokens).

export type ApiTokenDto = z.infer<typeof apiTokenSchema>;

const ATTRIBUTES = ['id', 'name', 'access', 'prefix', 'createdAt', 'lastUsedAt', 'revokedAt'] as const;
type Row = Pick<ApiToken, (typeof ATTRIBUTES)[number]> & { createdBy: { name: string | null } | null };

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
const toDto = (r: Row): ApiTokenDto => ({
  id: r.id,
  name: r.name,
  access: r.access,
  prefix: r.prefix,
  createdBy: r.createdBy?.name ?? null,
  createdAt: iso(r.createdAt)!,
  lastUsedAt: iso(r.lastUsedAt),
  revokedAt: iso(r.revokedAt),
});

function requireSessionActor(actor: Actor): void {
  requireCan(actor, 'tokens:manage');
  if (actor.apiTokenId) throw forbidden('Access tokens are managed from a signed-in session, not with a token.');
}

async function readToken(actor: Actor, id: number): Promise<ApiTokenDto> {
  const row = (await ApiToken.findOne({
    where: { id, coopId: actor.coop.id },
    attributes: [...ATTRIBUTES],
    include: [{ model: User, as: 'createdBy', attributes: ['name'] }],
    raw: true,
    nest: true,
  })) as unknown as Row | null;
  if (!row) throw notFound('Token not found.');
  return toDto(row);
}

/** The co-op's tokens, newest first, revoked ones included (never the token itself). */
export async function listApiTokens(actor: Actor): Promise<ApiTokenDto[]> {
  requireSessionActor(actor);
  const rows = (await ApiToken.findAll({
    where: { coopId: actor.coop.id },
    attributes: [...ATTRIBUTES],
    include: [{ model: User, as: 'createdBy', attributes: ['name'] }],
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: 500,
    raw: true,
    nest: true,
  })) as unknown as Row[];
  return rows.map(toDto);
}

/** Creates a token for the co-op; the answer is the only time the token itself is shown. */
export async function createApiToken(
  actor: Actor,
  input: z.infer<typeof apiTokenCreateSchema>,
): Promise<{ token: ApiTokenDto; secret: string }> {
  requireSessionActor(actor);
  const { token, hash, prefix } = newApiToken();
  const id = await inTransaction(async (transaction) => {
    const row = await ApiToken.create(
      {
        coopId: actor.coop.id,
        createdByUserId: actor.user.id,
        name: input.name,
        access: input.access,
        tokenHash: hash,
        prefix,
      },
      { transaction },
    );
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'api-token.create',
        entityType: 'api-token',
        entityId: row.id,
        after: { name: input.name, access: input.access, prefix },
      },
      transaction,
    );
    return row.id;
  });
  return { token: await readToken(actor, id), secret: token };
}

/** Revokes a token: from the next request on it authenticates nothing. */
export async function revokeApiToken(actor: Actor, id: number): Promise<ApiTokenDto> {
  requireSessionActor(actor);
  await inTransaction(async (transaction) => {
    const row = await ApiToken.findOne({
      where: { id, coopId: actor.coop.id },
      attributes: ['id', 'name', 'revokedAt'],
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!row) throw notFound('Token not found.');
    if (row.revokedAt) throw conflict('This token is already revoked.');
    await ApiToken.update(
      { revokedAt: fn('now') as unknown as Date },
      { where: { id, coopId: actor.coop.id }, transaction },
    );
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'api-token.revoke',
        entityType: 'api-token',
        entityId: id,
        before: { name: row.name },
      },
      transaction,
    );
  });
  return readToken(actor, id);
}
