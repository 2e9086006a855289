import 'server-only';
import { QueryTypes, type InferAttributes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';
import type { Tank } from '@/models';

/** What the guarded update answers: the tank's name and totals after adding the reservation. */
export type ReservedTank = Pick<InferAttributes<Tank>, 'id' | 'name' | 'onHandLiters' | 'reservedLiters'>;

/**
 * Adds `liters` to a tank's reserved total only while the tank is the co-op's, in service, and
 * its on hand − reserved still covers them. The condition is on the row being updated: when
 * another transaction holds the row (a reservation, a draw, a dip raising or lowering the stock),
 * PostgreSQL waits for it and then re-checks the condition on the row as that one left it, so a
 * reservation racing a dip is either added to what is really there or refused — never a CHECK
 * violation. The row stays locked until the caller's transaction ends.
 * @param liters NUMERIC text, e.g. "47.318"
 * @returns the updated tank, or null when the guard refused (nothing written)
 */
export async function addReservedLiters(coopId: number, tankId: number, liters: string, transaction: Transaction): Promise<ReservedTank | null> {
  const rows = await sequelize.query<ReservedTank>(
    `UPDATE tanks SET reserved_liters = reserved_liters + $liters::numeric, updated_at = now()
     WHERE id = $tankId AND coop_id = $coopId AND active AND on_hand_liters - reserved_liters >= $liters::numeric
     RETURNING id, name, on_hand_liters AS "onHandLiters", reserved_liters AS "reservedLiters"`,
    { bind: { coopId, tankId, liters }, type: QueryTypes.SELECT, transaction },
  );
  return rows[0] ?? null;
}
