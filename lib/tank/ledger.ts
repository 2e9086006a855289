import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';
import { HttpError } from '@/lib/http';
import { litersToMl, mlToLiters } from './quantity';

export type MovementKind = 'release' | 'draw' | 'draw-reversal' | 'dip-adjustment' | 'transfer-in' | 'transfer-out';

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
}

export interface MovementResult {
  id: string;
  quantityMl: number;
  valueCents: number;
  onHandAfterMl: number;
  valueAfterCents: number;
}

/**
 * The only way fuel enters or leaves a tank: locks the tank row (coop-scoped), applies the
 * movement to its running totals at the moving weighted-average cost, and appends the ledger
 * row — inside the caller's transaction. Refuses (409) anything that would take on-hand below
 * zero or an outflow that would dip into reserved fuel (a draw against a reservation releases
 * that reservation first, in the same transaction); the database CHECKs back this up.
 */
export async function recordMovement(t: Transaction, m: MovementInput): Promise<MovementResult> {
  if (!Number.isInteger(m.quantityMl) || m.quantityMl === 0) throw new Error('quantityMl must be a non-zero integer');
  const [tank] = await sequelize.query<{ on_hand_liters: string; reserved_liters: string; value_cents: string }>(
    `SELECT on_hand_liters, reserved_liters, value_cents FROM tanks WHERE id = :tankId AND coop_id = :coopId FOR UPDATE`,
    { replacements: { tankId: m.tankId, coopId: m.coopId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!tank) throw new HttpError(404, 'Tank not found.');
  const onHand = litersToMl(tank.on_hand_liters);
  const reserved = litersToMl(tank.reserved_liters);
  const value = Number(tank.value_cents);
  const after = onHand + m.quantityMl;
  if (after < 0) {
    throw new HttpError(409, `The tank holds only ${mlToLiters(onHand)} L.`, { quantity: ['More than the tank holds.'] }, { onHandLiters: mlToLiters(onHand) });
  }
  let moved: number;
  if (m.valueCents !== undefined) moved = m.valueCents;
  else if (m.quantityMl < 0) moved = after === 0 ? -value : -Math.round((value * -m.quantityMl) / onHand);
  else moved = onHand > 0 ? Math.round((value * m.quantityMl) / onHand) : 0;
  const valueAfter = Math.max(0, value + moved);
  if (m.quantityMl < 0 && after < reserved) {
    throw new HttpError(409, `That would leave less fuel (${mlToLiters(after)} L) than members have reserved (${mlToLiters(reserved)} L).`, {
      quantity: ['Less than the reserved amount would remain.'],
    });
  }
  await sequelize.query(
    `UPDATE tanks SET on_hand_liters = :after, value_cents = :valueAfter, updated_at = now() WHERE id = :tankId AND coop_id = :coopId`,
    { replacements: { after: mlToLiters(after), valueAfter, tankId: m.tankId, coopId: m.coopId }, transaction: t },
  );
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents,
       batch_id, draw_id, transfer_tank_id, reason, created_by_user_id, occurred_at)
     VALUES (:coopId, :tankId, :kind, :q, :moved, :after, :valueAfter, :batchId, :drawId, :transferTankId, :reason, :userId, :occurredAt)
     RETURNING id`,
    {
      replacements: {
        coopId: m.coopId, tankId: m.tankId, kind: m.kind, q: mlToLiters(m.quantityMl), moved, after: mlToLiters(after), valueAfter,
        batchId: m.batchId ?? null, drawId: m.drawId ?? null, transferTankId: m.transferTankId ?? null, reason: m.reason ?? null,
        userId: m.userId, occurredAt: m.occurredAt ?? new Date(),
      },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  return { id: row!.id, quantityMl: m.quantityMl, valueCents: moved, onHandAfterMl: after, valueAfterCents: valueAfter };
}
