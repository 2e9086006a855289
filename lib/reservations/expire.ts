import 'server-only';
import type { Transaction } from 'sequelize';
import { queryRows, statement } from '@/lib/db';

/**
 * The lazy expiry, as SQL shared by the statements that need it. Marks the co-op's open
 * reservations whose window has ended as expired, gives their quantity back to each tank's
 * reserved total and writes an audit event per reservation — all in one statement, so it is
 * atomic by itself and two requests expiring at once cannot release a reservation twice (the
 * second UPDATE re-checks status = 'open' after the first commits). No cron is needed: it runs
 * at the start of every reserve, cancel and draw transaction and on every tank read.
 * The co-op id is the statement's $1.
 */
export const EXPIRE_CTES = `
  expired AS (
    UPDATE reservations SET status = 'expired', closed_at = now(), updated_at = now()
    WHERE coop_id = $1 AND status = 'open' AND window_end < now()
    RETURNING id, tank_id, quantity_liters
  ),
  expired_per_tank AS (SELECT tank_id, sum(quantity_liters) AS liters FROM expired GROUP BY tank_id),
  expired_tanks AS (
    UPDATE tanks t SET reserved_liters = t.reserved_liters - p.liters, updated_at = now()
    FROM expired_per_tank p WHERE t.id = p.tank_id AND t.coop_id = $1
    RETURNING t.id
  ),
  expired_audit AS (
    INSERT INTO audit_events (coop_id, actor_user_id, action, entity_type, entity_id, before, after)
    SELECT $1, NULL, 'reservation.expire', 'reservation', e.id::text,
           jsonb_build_object('status', 'open'), jsonb_build_object('status', 'expired', 'quantityLiters', e.quantity_liters)
    FROM expired e
    RETURNING 1
  )`;

/** The expiry on its own, answering how many reservations it expired. */
export const EXPIRE_STATEMENT = statement(
  `WITH ${EXPIRE_CTES} SELECT (SELECT count(*) FROM expired)::text AS n, (SELECT count(*) FROM expired_tanks) AS t, (SELECT count(*) FROM expired_audit) AS a`,
  'tv_expire_reservations',
);

/**
 * Expires lapsed reservations of a co-op (inside the caller's transaction, before it takes any
 * tank lock, so the lock order stays reservations → tanks everywhere).
 * @returns how many reservations expired
 */
export async function expireLapsedReservations(coopId: number, transaction?: Transaction): Promise<number> {
  const [row] = await queryRows<{ n: string }>(EXPIRE_STATEMENT, [coopId], transaction);
  return Number(row?.n ?? 0);
}
