import 'server-only';
import type { oilLotSchema } from '@/lib/api/dto/brewing';
import type { z } from 'zod';
import {
  col,
  fn,
  literal,
  Op,
  where,
  type FindAttributeOptions,
  type InferAttributes,
  type Transaction,
} from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { notFound } from '@/lib/http';
import { inTransaction } from '@/lib/db';
import { volumeToLiters } from '@/lib/units';
import type { OilLotCreateInput } from '@/lib/validation/brewing';
import type { Paged } from '@/lib/validation/list';
import { OilLot } from '@/models';
import { numericOrNull } from '@/lib/units/quantity';

// Oil lots: collected waste oil, with what batches have taken from each (batch_oil_lots).

/** An oil lot with what batches have taken from it. */
export type OilLotDto = z.infer<typeof oilLotSchema>;

type OilLotRow = Pick<
  InferAttributes<OilLot>,
  | 'id'
  | 'collectedFrom'
  | 'collectedOn'
  | 'volumeLiters'
  | 'costCents'
  | 'waterNotes'
  | 'solidsNotes'
  | 'titrationMl'
  | 'titrant'
> & { usedLiters: string | null };

function oilDto(r: OilLotRow): OilLotDto {
  const volume = Number(r.volumeLiters);
  const used = Number(r.usedLiters ?? 0);
  return {
    id: r.id,
    collectedFrom: r.collectedFrom,
    collectedOn: r.collectedOn,
    volumeLiters: volume,
    usedLiters: used,
    remainingLiters: Number(Math.max(0, volume - used).toFixed(3)),
    costCents: Number(r.costCents),
    waterNotes: r.waterNotes,
    solidsNotes: r.solidsNotes,
    titrationMl: numericOrNull(r.titrationMl),
    titrant: r.titrant,
  };
}

/**
 * Litres of the lot that batches have taken: a correlated sum over batch_oil_lots (by its primary
 * key). The outer table goes by the model's name, which the production bundle shortens, so it is
 * read at run time.
 */
const usedLiters = () =>
  literal(
    `(SELECT COALESCE(sum(bol.liters), 0) FROM batch_oil_lots bol WHERE bol.oil_lot_id = "${OilLot.name}"."id" AND bol.coop_id = "${OilLot.name}"."coop_id")`,
  );
const oilAttributes = (): FindAttributeOptions => [
  'id',
  'collectedFrom',
  'collectedOn',
  'volumeLiters',
  'costCents',
  'waterNotes',
  'solidsNotes',
  'titrationMl',
  'titrant',
  [usedLiters(), 'usedLiters'],
];

const OIL_SORT: Record<string, string | ReturnType<typeof fn>> = {
  collectedOn: 'collectedOn',
  collectedFrom: fn('lower', col('collected_from')),
  volume: 'volumeLiters',
  titration: 'titrationMl',
};

/** Oil lots of the actor's co-op, one page, with litres already used by batches. */
export async function listOilLots(
  actor: Actor,
  q: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc' },
): Promise<Paged<OilLotDto>> {
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const where = { coopId: actor.coop.id };
  const [rows, total] = await Promise.all([
    OilLot.findAll({
      attributes: oilAttributes(),
      where,
      raw: true,
      order: [
        [OIL_SORT[q.sort] ?? 'collectedOn', `${dir} NULLS LAST`],
        ['id', dir],
      ],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
    }) as unknown as Promise<OilLotRow[]>,
    OilLot.count({ where }),
  ]);
  return { rows: rows.map(oilDto), total, page: q.page, pageSize: q.pageSize };
}

/** Oil lots that still hold oil (for the planner and batch forms), oldest first. */
export async function listOilLotsWithOil(actor: Actor): Promise<OilLotDto[]> {
  const rows = (await OilLot.findAll({
    attributes: oilAttributes(),
    where: { coopId: actor.coop.id, [Op.and]: [where(col(`${OilLot.name}.volume_liters`), { [Op.gt]: usedLiters() })] },
    order: [
      ['collectedOn', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: 200,
    raw: true,
  })) as unknown as OilLotRow[];
  return rows.map(oilDto);
}

/** One oil lot of the actor's co-op (404 otherwise), locked FOR UPDATE when read in the caller's transaction. */
export async function getOilLot(actor: Actor, id: number, transaction?: Transaction): Promise<OilLotDto> {
  const row = (await OilLot.findOne({
    attributes: oilAttributes(),
    where: { id, coopId: actor.coop.id },
    raw: true,
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  })) as unknown as OilLotRow | null;
  if (!row) throw notFound('Oil lot not found.');
  return oilDto(row);
}

/**
 * Records collected oil. The volume is typed in the co-op's units and stored in litres; a
 * titration without a titrant is taken as made with the co-op's usual catalyst.
 */
export async function createOilLot(actor: Actor, input: OilLotCreateInput): Promise<OilLotDto> {
  const liters = volumeToLiters(input.volume, actor.coop.units).toFixed(3);
  const titrant =
    input.titrationMl === undefined ? null : (input.titrant ?? actor.coop.settings.recipe?.catalyst ?? 'KOH');
  return inTransaction(async (transaction) => {
    const lot = await OilLot.create(
      {
        coopId: actor.coop.id,
        collectedFrom: input.collectedFrom,
        collectedOn: input.collectedOn,
        volumeLiters: liters,
        costCents: String(input.cost ?? 0),
        waterNotes: input.waterNotes ?? null,
        solidsNotes: input.solidsNotes ?? null,
        titrationMl: input.titrationMl === undefined ? null : input.titrationMl.toFixed(2),
        titrant,
        createdByUserId: actor.user.id,
      },
      { transaction },
    );
    const dto = await getOilLot(actor, lot.id, transaction);
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'oil-lot.create',
        entityType: 'oil_lot',
        entityId: lot.id,
        after: dto,
      },
      transaction,
    );
    return dto;
  });
}
