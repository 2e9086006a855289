import 'server-only';
import type { drawBatchSchema } from '@/lib/api/dto/tank';
import type {
  batchLineageSchema,
  lineageDrawSchema,
  lineageMemberSchema,
  reviewSchema,
  tankLayersSchema,
} from '@/lib/api/dto/lineage';
import type { z } from 'zod';
import { Op, type InferAttributes, type Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { notFound } from '@/lib/http';
import { roundHalfUp } from '@/lib/money';
import { litersToMl } from '@/lib/units/quantity';
import { mlToUnits3 } from '@/lib/tank/volume';
import type { UnitSystem } from '@/lib/units';
import {
  Batch,
  BatchReview,
  Draw,
  Membership,
  MovementBatchShare,
  Tank,
  TankLayer,
  TankMovement,
  User,
} from '@/models';
import type { TankMixing } from '@/models/Tank';
import type { TankMovementKind } from '@/models/TankMovement';

/** A review as screens and JSON see it: the API's BatchReview. */
export type ReviewDto = z.infer<typeof reviewSchema>;

export function reviewDto(r: InferAttributes<BatchReview>): ReviewDto {
  return {
    id: r.id,
    status: r.status,
    cause: r.cause,
    finding: r.finding,
    heldLiters: litersToMl(r.heldLiters) / 1000,
    openedAt: new Date(r.openedAt).toISOString(),
    outcome: r.outcome ?? null,
    outcomeNotes: r.outcomeNotes ?? null,
    disposalMethod: r.disposalMethod ?? null,
    receiptFileId: r.receiptFileId ?? null,
    retreatBatchId: r.retreatBatchId ?? null,
    closedAt: r.closedAt ? new Date(r.closedAt).toISOString() : null,
  };
}

/** One draw that carried some of the batch (a reversal carries it back: negative). */
export type LineageDraw = z.infer<typeof lineageDrawSchema>;

/** A member who received some of the batch, net of reversals. */
export type LineageMember = z.infer<typeof lineageMemberSchema>;

/** Where a batch's fuel went: the API's BatchLineage. */
export type BatchLineage = z.infer<typeof batchLineageSchema>;

type ShareRow = Pick<InferAttributes<MovementBatchShare>, 'drawId' | 'tankId' | 'quantityLiters'> & {
  movement: { kind: TankMovementKind };
  tank: { name: string };
  draw: {
    id: number | null;
    membershipId: number;
    quantityLiters: string;
    fuelCents: string;
    occurredAt: Date;
    reversesDrawId: number | null;
    membership: { user: { name: string; email: string } };
  };
};

/** Every ledger row share of a batch, with its draw and member where it was a draw. */
export async function batchShareRows(coopId: number, batchId: number, transaction?: Transaction): Promise<ShareRow[]> {
  return (await MovementBatchShare.findAll({
    attributes: ['drawId', 'tankId', 'quantityLiters'],
    where: { coopId, batchId },
    include: [
      { model: TankMovement, as: 'movement', attributes: ['kind'], required: true },
      { model: Tank, as: 'tank', attributes: ['name'], where: { coopId }, required: true },
      {
        model: Draw,
        as: 'draw',
        attributes: ['id', 'membershipId', 'quantityLiters', 'fuelCents', 'occurredAt', 'reversesDrawId'],
        where: { coopId },
        required: false,
        include: [
          {
            model: Membership,
            as: 'membership',
            attributes: [],
            include: [{ model: User, as: 'user', attributes: ['name', 'email'] }],
          },
        ],
      },
    ],
    order: [['id', 'ASC']],
    raw: true,
    nest: true,
    transaction,
  })) as unknown as ShareRow[];
}

/** The draws and members of a batch from its share rows (members net of reversals, only those left with some). */
export function drawsAndMembers(
  rows: ShareRow[],
  units: UnitSystem,
): { draws: LineageDraw[]; members: LineageMember[] } {
  const draws: LineageDraw[] = [];
  const members = new Map<number, LineageMember>();
  for (const r of rows) {
    if (r.drawId === null || r.draw?.id == null) continue;
    const batchMl = -litersToMl(r.quantityLiters); // a draw row is negative in the ledger: the member received it
    const drawMl = litersToMl(r.draw.quantityLiters);
    const valueCents =
      drawMl === 0
        ? 0
        : roundHalfUp((Number(r.draw.fuelCents) * Math.abs(batchMl)) / Math.abs(drawMl)) * Math.sign(batchMl);
    draws.push({
      drawId: r.draw.id,
      occurredAt: new Date(r.draw.occurredAt).toISOString(),
      tankName: r.tank.name,
      membershipId: r.draw.membershipId,
      memberName: r.draw.membership.user.name,
      batchMl,
      batchQuantity: mlToUnits3(batchMl, units),
      drawMl,
      drawQuantity: mlToUnits3(drawMl, units),
      valueCents,
      isReversal: r.draw.reversesDrawId !== null,
    });
    const m = members.get(r.draw.membershipId) ?? {
      membershipId: r.draw.membershipId,
      name: r.draw.membership.user.name,
      email: r.draw.membership.user.email,
      batchMl: 0,
      batchQuantity: 0,
      valueCents: 0,
    };
    m.batchMl += batchMl;
    m.valueCents += valueCents;
    m.batchQuantity = mlToUnits3(m.batchMl, units);
    members.set(m.membershipId, m);
  }
  return {
    draws,
    members: [...members.values()].filter((m) => m.batchMl > 0).sort((a, b) => a.name.localeCompare(b.name)),
  };
}

/**
 * Where a batch's fuel went: what is left in which tank, the net volume by kind of ledger entry,
 * every draw that carried some of it with the member and the value, the members net of
 * reversals (the possible credit), and its reviews. Brewers, treasurers and admins (lineage:read).
 */
export async function getBatchLineage(actor: Actor, batchId: number): Promise<BatchLineage> {
  const coopId = actor.coop.id;
  const units = actor.coop.units;
  const [batch, layers, rows, reviews] = await Promise.all([
    Batch.findOne({ attributes: ['id', 'number', 'status'], where: { id: batchId, coopId }, raw: true }),
    TankLayer.findAll({
      attributes: ['tankId', 'quantityLiters'],
      where: { coopId, batchId },
      include: [
        { model: Tank, as: 'tank', attributes: ['name', 'mixing', 'heldLiters'], where: { coopId }, required: true },
      ],
      order: [['id', 'ASC']],
      raw: true,
      nest: true,
    }) as unknown as Promise<
      (Pick<InferAttributes<TankLayer>, 'tankId' | 'quantityLiters'> & {
        tank: { name: string; mixing: TankMixing; heldLiters: string };
      })[]
    >,
    batchShareRows(coopId, batchId),
    BatchReview.findAll({
      where: { coopId, batchId },
      order: [
        ['openedAt', 'DESC'],
        ['id', 'DESC'],
      ],
      raw: true,
    }),
  ]);
  if (!batch) throw notFound('Batch not found.');
  const tanks = new Map<number, BatchLineage['inTanks'][number]>();
  for (const l of layers) {
    const t = tanks.get(l.tankId) ?? {
      tankId: l.tankId,
      tankName: l.tank.name,
      mixing: l.tank.mixing,
      ml: 0,
      quantity: 0,
      heldLiters: litersToMl(l.tank.heldLiters) / 1000,
    };
    t.ml += litersToMl(l.quantityLiters);
    t.quantity = mlToUnits3(t.ml, units);
    tanks.set(l.tankId, t);
  }
  const byKind: BatchLineage['byKind'] = {};
  for (const r of rows) byKind[r.movement.kind] = (byKind[r.movement.kind] ?? 0) + litersToMl(r.quantityLiters);
  return {
    batchId: batch.id,
    number: batch.number,
    status: batch.status,
    units,
    inTanks: [...tanks.values()],
    byKind,
    ...drawsAndMembers(rows, units),
    reviews: reviews.map(reviewDto),
  };
}

/** A tank's layers, oldest first, with their batches and whether each is under review. Any member (tank:read). */
export async function listTankLayers(actor: Actor, tankId: number): Promise<TankLayersDto> {
  const coopId = actor.coop.id;
  const [tank, layers] = await Promise.all([
    Tank.findOne({
      attributes: ['id', 'name', 'mixing', 'onHandLiters', 'heldLiters'],
      where: { id: tankId, coopId },
      raw: true,
    }),
    TankLayer.findAll({
      attributes: ['id', 'batchId', 'quantityLiters'],
      where: { coopId, tankId },
      include: [{ model: Batch, as: 'batch', attributes: ['number'], required: false }],
      order: [['id', 'ASC']],
      raw: true,
      nest: true,
    }) as unknown as Promise<
      (Pick<InferAttributes<TankLayer>, 'id' | 'batchId' | 'quantityLiters'> & { batch: { number: number | null } })[]
    >,
  ]);
  if (!tank) throw notFound('Tank not found.');
  const ids = [...new Set(layers.map((l) => l.batchId).filter((b): b is number => b !== null))];
  const open = ids.length
    ? await BatchReview.findAll({
        attributes: ['batchId'],
        where: { coopId, status: 'open', batchId: { [Op.in]: ids } },
        raw: true,
      })
    : [];
  const held = new Set(open.map((r) => r.batchId));
  const units = actor.coop.units;
  const onHandMl = litersToMl(tank.onHandLiters);
  return {
    tankId: tank.id,
    tankName: tank.name,
    mixing: tank.mixing as TankMixing,
    units,
    onHand: mlToUnits3(onHandMl, units),
    held: mlToUnits3(litersToMl(tank.heldLiters), units),
    heldLiters: litersToMl(tank.heldLiters) / 1000,
    layers: layers.map((l) => {
      const ml = litersToMl(l.quantityLiters);
      return {
        id: l.id,
        batchId: l.batchId,
        batchNumber: l.batch?.number ?? null,
        quantity: mlToUnits3(ml, units),
        quantityLiters: ml / 1000,
        sharePct: onHandMl > 0 ? Math.round((ml / onHandMl) * 1000) / 10 : 0,
        underReview: l.batchId !== null && held.has(l.batchId),
      };
    }),
  };
}

export type TankLayersDto = z.infer<typeof tankLayersSchema>;

/** The batches in each of these draws (positive quantities in the co-op's unit), for the draw lists. */
export type DrawBatch = z.infer<typeof drawBatchSchema>;
export async function drawBatches(
  coopId: number,
  units: UnitSystem,
  drawIds: number[],
): Promise<Map<number, DrawBatch[]>> {
  const out = new Map<number, DrawBatch[]>();
  if (drawIds.length === 0) return out;
  const rows = (await MovementBatchShare.findAll({
    attributes: ['drawId', 'batchId', 'quantityLiters'],
    where: { coopId, drawId: { [Op.in]: drawIds } },
    include: [{ model: Batch, as: 'batch', attributes: ['number'], required: false }],
    order: [['id', 'ASC']],
    raw: true,
    nest: true,
  })) as unknown as (Pick<InferAttributes<MovementBatchShare>, 'drawId' | 'batchId' | 'quantityLiters'> & {
    batch: { number: number | null };
  })[];
  for (const r of rows) {
    const list = out.get(r.drawId!) ?? [];
    const ml = Math.abs(litersToMl(r.quantityLiters));
    list.push({ batchId: r.batchId, batchNumber: r.batch?.number ?? null, ml, quantity: mlToUnits3(ml, units) });
    out.set(r.drawId!, list);
  }
  return out;
}

export interface RecallNotice {
  batchId: number;
  batchNumber: number;
  status: 'open' | 'closed';
  finding: string;
  outcome: ReviewDto['outcome'];
  openedAt: string;
  closedAt: string | null;
  /** What the member received of the batch, in the co-op's unit. */
  quantity: number;
}

/**
 * Notices for the signed-in member's overview: batches under review (or reviewed in the last 60
 * days) that they drew some of, with how much. One small query when no batch is under review.
 */
export async function recallNoticesFor(actor: Actor): Promise<RecallNotice[]> {
  const coopId = actor.coop.id;
  const reviews = (await BatchReview.findAll({
    attributes: ['batchId', 'status', 'finding', 'outcome', 'openedAt', 'closedAt'],
    where: {
      coopId,
      [Op.or]: [{ status: 'open' }, { closedAt: { [Op.gte]: new Date(Date.now() - 60 * 86_400_000) } }],
    },
    include: [{ model: Batch, as: 'batch', attributes: ['number'], required: true }],
    order: [['openedAt', 'DESC']],
    raw: true,
    nest: true,
  })) as unknown as (Pick<
    InferAttributes<BatchReview>,
    'batchId' | 'status' | 'finding' | 'outcome' | 'openedAt' | 'closedAt'
  > & { batch: { number: number } })[];
  if (reviews.length === 0) return [];
  const shares = (await MovementBatchShare.findAll({
    attributes: ['batchId', 'quantityLiters'],
    where: { coopId, batchId: { [Op.in]: [...new Set(reviews.map((r) => r.batchId))] }, drawId: { [Op.ne]: null } },
    include: [
      { model: Draw, as: 'draw', attributes: [], where: { coopId, membershipId: actor.membershipId }, required: true },
    ],
    raw: true,
  })) as Pick<InferAttributes<MovementBatchShare>, 'batchId' | 'quantityLiters'>[];
  const mine = new Map<number, number>();
  for (const s of shares) mine.set(s.batchId!, (mine.get(s.batchId!) ?? 0) - litersToMl(s.quantityLiters));
  const seen = new Set<number>();
  return reviews.flatMap((r) => {
    const ml = mine.get(r.batchId) ?? 0;
    if (ml <= 0 || seen.has(r.batchId)) return [];
    seen.add(r.batchId);
    return [
      {
        batchId: r.batchId,
        batchNumber: r.batch.number,
        status: r.status,
        finding: r.finding,
        outcome: r.outcome ?? null,
        openedAt: new Date(r.openedAt).toISOString(),
        closedAt: r.closedAt ? new Date(r.closedAt).toISOString() : null,
        quantity: mlToUnits3(ml, actor.coop.units),
      },
    ];
  });
}
