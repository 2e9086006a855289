import 'server-only';
import type { Transaction } from 'sequelize';
import { HttpError } from '@/lib/http';
import { Tank, TankMovement } from '@/models';
import { defaultSource, planLineage, writeLineage, type BatchShare, type LineageSource } from './lineage';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import type { TankMovementKind as MovementKind } from '@/models/TankMovement';

export type { TankMovementKind as MovementKind } from '@/models/TankMovement';

export interface MovementInput {
  coopId: number;
  tankId: number;
  kind: MovementKind;
  /** Signed: positive into the tank, negative out of it. */
  quantityMl: number;
  /**
   * Stock value moved, integer cents. Required for inflows that bring their own cost (a released
   * batch, a transfer in, a draw reversal). Outflows and inflows without it move value at the
   * tank's moving-average cost.
   */
  valueCents?: number;
  batchId?: number | null;
  drawId?: number | null;
  transferTankId?: number | null;
  reason?: string | null;
  userId: number | null;
  occurredAt?: Date;
  /**
   * Which batches the row moves (lib/tank/lineage). Defaults by kind: a release brings its
   * batch, draws and transfers out follow the tank's mixing model, a dip spreads over the layers
   * (a valued gain is unattributed fuel). Transfers in, reversals, disposals and re-treatments
   * must name their shares. An opening balance: `{ kind: 'origin', batchId: null }`.
   */
  lineage?: LineageSource;
}

export interface MovementResult {
  id: string;
  quantityMl: number;
  valueCents: number;
  onHandAfterMl: number;
  valueAfterCents: number;
  /** The batches the row moved, positive millilitres (the row's sign applies). */
  shares: BatchShare[];
}

/**
 * The only way fuel enters or leaves a tank: locks the tank row (coop-scoped), applies the
 * movement to its running totals at the moving weighted-average cost, and appends the ledger
 * row — inside the caller's transaction. Refuses (409) anything that would take on-hand below
 * zero or an outflow that would dip into reserved fuel (a draw against a reservation releases
 * that reservation first, in the same transaction); the database CHECKs back this up. Every row
 * also moves the tank's batch layers (lib/tank/lineage): held fuel cannot leave by a draw or a
 * transfer, and the row's batch shares are written beside it.
 */
export async function recordMovement(t: Transaction, m: MovementInput): Promise<MovementResult> {
  if (!Number.isInteger(m.quantityMl) || m.quantityMl === 0) throw new Error('quantityMl must be a non-zero integer');
  const tank = await Tank.findOne({
    attributes: ['onHandLiters', 'reservedLiters', 'valueCents', 'mixing'],
    where: { id: m.tankId, coopId: m.coopId },
    lock: t.LOCK.UPDATE,
    transaction: t,
    raw: true,
  });
  if (!tank) throw new HttpError(404, 'Tank not found.');
  const onHand = litersToMl(tank.onHandLiters);
  const reserved = litersToMl(tank.reservedLiters);
  const value = Number(tank.valueCents);
  const after = onHand + m.quantityMl;
  if (after < 0) {
    throw new HttpError(
      409,
      `The tank holds only ${mlToLiters(onHand)} L.`,
      { quantity: ['More than the tank holds.'] },
      { onHandLiters: mlToLiters(onHand) },
    );
  }
  let moved: number;
  if (m.valueCents !== undefined) moved = m.valueCents;
  else if (m.quantityMl < 0) moved = after === 0 ? -value : -Math.round((value * -m.quantityMl) / onHand);
  else moved = onHand > 0 ? Math.round((value * m.quantityMl) / onHand) : 0;
  const valueAfter = Math.max(0, value + moved);
  if (m.quantityMl < 0 && after < reserved) {
    throw new HttpError(
      409,
      `That would leave less fuel (${mlToLiters(after)} L) than members have reserved (${mlToLiters(reserved)} L).`,
      {
        quantity: ['Less than the reserved amount would remain.'],
      },
    );
  }
  const source = m.lineage ?? defaultSource(m.kind, m.quantityMl, m.batchId ?? null, m.valueCents !== undefined);
  const plan = await planLineage(t, {
    coopId: m.coopId,
    tankId: m.tankId,
    mixing: tank.mixing,
    onHandMl: onHand,
    quantityMl: m.quantityMl,
    source,
  });
  await Tank.update(
    { onHandLiters: mlToLiters(after), valueCents: String(valueAfter), heldLiters: mlToLiters(plan.heldAfterMl) },
    { where: { id: m.tankId, coopId: m.coopId }, transaction: t },
  );
  const row = await TankMovement.create(
    {
      coopId: m.coopId,
      tankId: m.tankId,
      kind: m.kind,
      quantityLiters: mlToLiters(m.quantityMl),
      valueCents: String(moved),
      onHandAfterLiters: mlToLiters(after),
      valueAfterCents: String(valueAfter),
      batchId: m.batchId ?? null,
      drawId: m.drawId ?? null,
      transferTankId: m.transferTankId ?? null,
      reason: m.reason ?? null,
      createdByUserId: m.userId,
      occurredAt: m.occurredAt ?? new Date(),
    },
    { transaction: t, returning: ['id'] },
  );
  await writeLineage(t, plan, {
    movementId: String(row.id),
    drawId: m.drawId ?? null,
    sign: m.quantityMl > 0 ? 1 : -1,
  });
  return {
    id: String(row.id),
    quantityMl: m.quantityMl,
    valueCents: moved,
    onHandAfterMl: after,
    valueAfterCents: valueAfter,
    shares: plan.shares,
  };
}
