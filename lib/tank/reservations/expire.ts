import 'server-only';
import { fn, Op, type Transaction } from 'sequelize';
import { litersToMl } from '@/lib/units/quantity';
import { AuditEvent, Reservation, Tank } from '@/models';

/**
 * Marks a co-op's open reservations whose window has ended as expired, gives their quantity
 * back to each tank's reserved total and writes an audit event per reservation — inside the
 * caller's transaction. Only write paths call it (reserving, drawing, dips,
 * transfers, taking a tank out of service), always before they take any tank lock, so the lock
 * order stays reservations → tanks everywhere; reads never do (they count a lapsed reservation as
 * not reserved without changing it). A background job may call it too.
 *
 * Two transactions expiring at once cannot release a reservation twice: the second UPDATE waits
 * for the first's row locks and then re-checks status = 'open'.
 * @returns how many reservations expired
 */
export async function expireLapsedReservations(coopId: number, transaction: Transaction): Promise<number> {
  const [, expired] = await Reservation.update(
    { status: 'expired', closedAt: new Date() },
    {
      where: { coopId, status: 'open', windowEnd: { [Op.lt]: fn('now') } },
      returning: true,
      transaction,
    },
  );
  if (expired.length === 0) return 0;
  const perTankMl = new Map<number, number>();
  for (const r of expired) perTankMl.set(r.tankId, (perTankMl.get(r.tankId) ?? 0) + litersToMl(r.quantityLiters));
  // In id order, so two expiries of the same co-op lock tanks in the same order.
  for (const [tankId, ml] of [...perTankMl].sort((a, b) => a[0] - b[0])) {
    await Tank.decrement({ reservedLiters: ml / 1000 }, { where: { id: tankId, coopId }, transaction });
  }
  await AuditEvent.bulkCreate(
    expired.map((r) => ({
      coopId,
      actorUserId: null,
      action: 'reservation.expire',
      entityType: 'reservation',
      entityId: String(r.id),
      before: { status: 'open' },
      after: { status: 'expired', quantityLiters: r.quantityLiters },
    })),
    { transaction },
  );
  return expired.length;
}

/**
 * Whether the co-op has open reservations whose window has ended (one indexed read), so a write
 * path that only needs lapsed reservations out of the way can skip the expiry transaction when
 * there are none. A reservation lapsing just after this read is harmless: it stays counted as
 * reserved until the next write or the scheduled expiry, which only ever refuses, never oversells.
 */
export async function hasLapsedReservations(coopId: number): Promise<boolean> {
  return (
    (await Reservation.findOne({
      attributes: ['id'],
      where: { coopId, status: 'open', windowEnd: { [Op.lt]: fn('now') } },
      raw: true,
    })) !== null
  );
}
