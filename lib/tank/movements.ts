import 'server-only';
import type { movementSchema } from '@/lib/api/dto/tank';
import type { InferAttributes, WhereOptions } from 'sequelize';
import type { z } from 'zod';
import type { Actor } from '@/lib/auth';
import { notFound } from '@/lib/http';
import type { movementListSchema } from '@/lib/validation/tank';
import { Draw, Membership, Tank, TankMovement, User } from '@/models';
import type { MovementKind } from './ledger';
import { litersToMl } from '@/lib/units/quantity';
import { mlToUnits3 } from './volume';

export type MovementDto = z.infer<typeof movementSchema>;

/** A ledger row as the list reads it (raw, nested includes). */
type MovementListRow = Pick<
  InferAttributes<TankMovement>,
  | 'id'
  | 'kind'
  | 'quantityLiters'
  | 'valueCents'
  | 'onHandAfterLiters'
  | 'valueAfterCents'
  | 'reason'
  | 'batchId'
  | 'drawId'
  | 'occurredAt'
> & {
  createdBy: { name: string | null };
  transferTank: { name: string | null };
  draw: { membership: { user: { name: string | null } } };
};

const MOVEMENT_SORT = { recorded: 'id', occurred_at: 'occurredAt', quantity: 'quantityLiters', kind: 'kind' } as const;

/**
 * A tank's ledger, a page at a time, sorted on the server (default: newest first as recorded).
 * @param actor brewer, treasurer or admin (draws:read-all)
 */
export async function listMovements(actor: Actor, tankId: number, q: z.infer<typeof movementListSchema>) {
  const units = actor.coop.units;
  const coopId = actor.coop.id;
  const where: WhereOptions<TankMovement> = { coopId, tankId };
  if (q.kind) where.kind = q.kind as MovementKind;
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const [tank, rows, total] = await Promise.all([
    Tank.findOne({ attributes: ['id'], where: { id: tankId, coopId }, raw: true }),
    TankMovement.findAll({
      attributes: [
        'id',
        'kind',
        'quantityLiters',
        'valueCents',
        'onHandAfterLiters',
        'valueAfterCents',
        'reason',
        'batchId',
        'drawId',
        'occurredAt',
      ],
      where,
      include: [
        { model: User, as: 'createdBy', attributes: ['name'] },
        { model: Tank, as: 'transferTank', attributes: ['name'], where: { coopId }, required: false },
        {
          model: Draw,
          as: 'draw',
          attributes: [],
          where: { coopId },
          required: false,
          include: [
            {
              model: Membership,
              as: 'membership',
              attributes: [],
              include: [{ model: User, as: 'user', attributes: ['name'] }],
            },
          ],
        },
      ],
      order: [
        [MOVEMENT_SORT[q.sort as keyof typeof MOVEMENT_SORT], dir],
        ['id', dir],
      ],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
      raw: true,
      nest: true,
    }) as unknown as Promise<MovementListRow[]>,
    TankMovement.count({ where }),
  ]);
  if (!tank) throw notFound('Tank not found.');
  const items: MovementDto[] = rows.map((r) => {
    const qMl = litersToMl(r.quantityLiters);
    const afterMl = litersToMl(r.onHandAfterLiters);
    return {
      id: r.id,
      kind: r.kind,
      quantityLiters: qMl / 1000,
      quantity: mlToUnits3(qMl, units),
      valueCents: Number(r.valueCents),
      onHandAfterLiters: afterMl / 1000,
      onHandAfter: mlToUnits3(afterMl, units),
      valueAfterCents: Number(r.valueAfterCents),
      reason: r.reason,
      batchId: r.batchId,
      drawId: r.drawId,
      memberName: r.draw?.membership?.user?.name ?? null,
      transferTankName: r.transferTank?.name ?? null,
      byName: r.createdBy?.name ?? null,
      occurredAt: new Date(r.occurredAt).toISOString(),
    };
  });
  return { items, page: q.page, pageSize: q.pageSize, total };
}
