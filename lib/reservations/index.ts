import 'server-only';
import { QueryTypes } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import { can, type Actor } from '@/lib/auth';
import { queryRowSets, sequelize, statement } from '@/lib/db';
import { conflict, HttpError, notFound } from '@/lib/http';
import { litersToMl, mlToLiters } from '@/lib/tank/quantity';
import { inTransaction } from '@/lib/tank/tx';
import { formatMl, milliUnitsToMl, mlToUnits3, mlToUnitsFloor, roundingCrumbMl } from '@/lib/tank/volume';
import type { reservationCreateSchema, reservationListSchema } from '@/lib/validation/tank';
import { EXPIRE_STATEMENT, expireLapsedReservations } from './expire';
import { parseWindowEdge, reservationWindow } from './window';

export type ReservationStatus = 'open' | 'drawn' | 'cancelled' | 'expired';

export interface ReservationDto {
  id: number;
  tankId: number;
  tankName: string;
  membershipId: number;
  memberName: string;
  quantityLiters: number;
  /** In the co-op's unit. */
  quantity: number;
  windowStart: string;
  windowEnd: string;
  status: ReservationStatus;
  closedAt: string | null;
  createdAt: string;
  /** The draw that closed it, when drawn. */
  drawId: number | null;
}

/** The 409 body when a tank cannot cover a request: how much is available, in litres and co-op units. */
function notEnough(actor: Actor, tankName: string, requestedMl: number, availableMl: number) {
  const units = actor.coop.units;
  const avail = Math.max(0, availableMl);
  return new HttpError(
    409,
    `${tankName} has only ${formatMl(avail, units, { floor: true, digits: 3 })} available, less than the ${formatMl(requestedMl, units, { digits: 3 })} you asked for.`,
    { quantity: [`At most ${formatMl(avail, units, { floor: true, digits: 3 })} is available.`] },
    { availableLiters: avail / 1000, available: mlToUnitsFloor(avail, units), unit: units === 'us' ? 'gal' : 'L' },
  );
}

/**
 * One statement, so it is atomic by itself and the tank row is locked only while it runs and
 * commits: lock the tank (waiting for any reservation in flight, then seeing its result), add
 * the quantity only if on hand − reserved still covers it (a request over by no more than the
 * rounding crumb is trimmed to exactly what is left), then write the reservation and its audit
 * event from the update's result. When the guard fails nothing at all is written.
 * $1 tank, $2 co-op, $3 litres asked, $4 the least litres accepted, $5 membership, $6–$7 window, $8 user.
 */
const RESERVE = statement(
  `WITH cur AS (
     SELECT id, name, on_hand_liters - reserved_liters AS avail FROM tanks
     WHERE id = $1::int AND coop_id = $2::int AND active FOR UPDATE
   ),
   guarded AS (
     UPDATE tanks t SET reserved_liters = t.reserved_liters + LEAST($3::numeric, cur.avail), updated_at = now()
     FROM cur WHERE t.id = cur.id AND cur.avail >= $4::numeric
     RETURNING t.id, cur.name, LEAST($3::numeric, cur.avail) AS liters
   ),
   created AS (
     INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end)
     SELECT $2::int, g.id, $5::int, g.liters, $6::timestamptz, $7::timestamptz FROM guarded g
     RETURNING id, tank_id, quantity_liters, window_start, window_end, created_at
   ),
   audited AS (
     INSERT INTO audit_events (coop_id, actor_user_id, action, entity_type, entity_id, after)
     SELECT $2::int, $8::int, 'reservation.create', 'reservation', c.id::text,
            jsonb_build_object('tankId', c.tank_id, 'membershipId', $5::int, 'quantityLiters', c.quantity_liters, 'windowStart', c.window_start, 'windowEnd', c.window_end)
     FROM created c RETURNING 1
   )
   SELECT c.id, c.quantity_liters::text AS liters, g.name, c.created_at, (SELECT count(*) FROM audited) AS audited
   FROM created c, guarded g`,
  'tv_reserve',
);

/**
 * Reserves fuel for the signed-in member (never for anyone else: the body has no member field).
 * The tank can never be oversold: the quantity is added to the tank's reserved total by one
 * guarded UPDATE that succeeds only while on hand − reserved still covers it; the row lock
 * makes concurrent reservations of the same tank take turns, each seeing the one before, so two
 * members cannot both take the last gallons. When the guard fails → 409 with what is available;
 * nothing is kept. (A CHECK reserved ≤ on hand backs this up in the table itself.)
 */
export async function createReservation(actor: Actor, input: z.infer<typeof reservationCreateSchema>): Promise<ReservationDto> {
  const units = actor.coop.units;
  const window = reservationWindow(input.windowStart, input.windowEnd, actor.coop.timezone);
  if (!window.ok) throw new HttpError(422, 'Some fields need attention.', window.fields);
  const qMl = milliUnitsToMl(input.quantity, units);
  if (qMl <= 0) throw new HttpError(422, 'Some fields need attention.', { quantity: ['Enter a quantity greater than zero.'] });
  // Sent in one message with the expiry of lapsed reservations, which runs first (so the lock order
  // stays reservations → tanks); the two run as one implicit transaction.
  const [, [row]] = await queryRowSets<[unknown[], { id: number; liters: string; name: string; created_at: Date }[]]>([
    [EXPIRE_STATEMENT, [actor.coop.id]],
    [RESERVE, [
      input.tankId, actor.coop.id, mlToLiters(qMl), mlToLiters(Math.max(1, qMl - roundingCrumbMl(units))), actor.membershipId,
      window.start.toISOString(), window.end.toISOString(), actor.user.id,
    ]],
  ]);
  if (!row) {
    const [t] = await sequelize.query<{ name: string; active: boolean; available: string }>(
      `SELECT name, active, (on_hand_liters - reserved_liters)::text AS available FROM tanks WHERE id = :tankId AND coop_id = :coopId`,
      { replacements: { tankId: input.tankId, coopId: actor.coop.id }, type: QueryTypes.SELECT },
    );
    if (!t || !t.active) throw new HttpError(422, 'Some fields need attention.', { tankId: ['Choose one of the co-op’s tanks that is in service.'] });
    throw notEnough(actor, t.name, qMl, litersToMl(t.available));
  }
  return resDto({
    id: row.id, tank_id: input.tankId, tank_name: row.name, membership_id: actor.membershipId, member_name: actor.user.name, quantity_liters: row.liters,
    window_start: window.start, window_end: window.end, status: 'open', closed_at: null, created_at: row.created_at, draw_id: null,
  }, actor);
}

/**
 * Cancels an open reservation and gives its quantity back to the tank. A member cancels their
 * own; brewers and admins (draws:record) may cancel anyone's. Someone else's → 404.
 */
export async function cancelReservation(actor: Actor, reservationId: number): Promise<ReservationDto> {
  await inTransaction(async (transaction) => {
    await expireLapsedReservations(actor.coop.id, transaction);
    const [r] = await sequelize.query<{ id: number; tank_id: number; membership_id: number; quantity_liters: string; status: ReservationStatus }>(
      `SELECT id, tank_id, membership_id, quantity_liters, status FROM reservations WHERE id = :id AND coop_id = :coopId FOR UPDATE`,
      { replacements: { id: reservationId, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction },
    );
    if (!r || (r.membership_id !== actor.membershipId && !can(actor.role, 'draws:record'))) throw notFound('Reservation not found.');
    if (r.status !== 'open') throw conflict(`This reservation is already ${r.status}; only an open reservation can be cancelled.`, { status: r.status });
    await sequelize.query(`UPDATE reservations SET status = 'cancelled', closed_at = now(), updated_at = now() WHERE id = :id AND coop_id = :coopId`, {
      replacements: { id: r.id, coopId: actor.coop.id }, transaction,
    });
    await sequelize.query(`UPDATE tanks SET reserved_liters = reserved_liters - :q, updated_at = now() WHERE id = :tankId AND coop_id = :coopId`, {
      replacements: { q: r.quantity_liters, tankId: r.tank_id, coopId: actor.coop.id }, transaction,
    });
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'reservation.cancel', entityType: 'reservation', entityId: r.id, before: { status: 'open' }, after: { status: 'cancelled', quantityLiters: r.quantity_liters } }, transaction);
  });
  return getReservation(actor, reservationId);
}

const RES_SORT = { created_at: 'r.created_at', window_end: 'r.window_end', quantity: 'r.quantity_liters', status: 'r.status' } as const;

/**
 * Reservations of the co-op, a page at a time. Members see only their own; brewers, treasurers
 * and admins (draws:read-all) see everyone's and may filter by member. Lapsed ones are expired first.
 */
export async function listReservations(actor: Actor, q: z.infer<typeof reservationListSchema>, opts: { own?: boolean } = {}) {
  await expireLapsedReservations(actor.coop.id);
  const own = opts.own || !can(actor.role, 'draws:read-all');
  const tz = actor.coop.timezone;
  const conds = ['r.coop_id = :coopId'];
  const rep: Record<string, unknown> = { coopId: actor.coop.id, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  if (own) { conds.push('r.membership_id = :me'); rep.me = actor.membershipId; }
  else if (q.membershipId) { conds.push('r.membership_id = :membershipId'); rep.membershipId = q.membershipId; }
  if (q.status) { conds.push('r.status = :status'); rep.status = q.status; }
  if (q.tankId) { conds.push('r.tank_id = :tankId'); rep.tankId = q.tankId; }
  if (q.from) { conds.push('r.window_end > :from'); rep.from = parseWindowEdge(q.from, tz, false); }
  if (q.to) { conds.push('r.window_start < :to'); rep.to = parseWindowEdge(q.to, tz, true); }
  const where = conds.join(' AND ');
  const order = `${RES_SORT[q.sort as keyof typeof RES_SORT]} ${q.dir === 'asc' ? 'ASC' : 'DESC'}, r.id DESC`;
  const [rows, [count]] = await Promise.all([
    sequelize.query<ResRow>(`${RES_SELECT} WHERE ${where} ORDER BY ${order} LIMIT :limit OFFSET :offset`, { replacements: rep, type: QueryTypes.SELECT }),
    sequelize.query<{ n: string }>(`SELECT count(*)::text AS n FROM reservations r WHERE ${where}`, { replacements: rep, type: QueryTypes.SELECT }),
  ]);
  return { items: rows.map((r) => resDto(r, actor)), page: q.page, pageSize: q.pageSize, total: Number(count?.n ?? 0) };
}

/** One reservation (own, or anyone's for draws:read-all roles); 404 otherwise. */
export async function getReservation(actor: Actor, id: number): Promise<ReservationDto> {
  const [row] = await sequelize.query<ResRow>(`${RES_SELECT} WHERE r.id = :id AND r.coop_id = :coopId`, { replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT });
  if (!row || (row.membership_id !== actor.membershipId && !can(actor.role, 'draws:read-all'))) throw notFound('Reservation not found.');
  return resDto(row, actor);
}

interface ResRow {
  id: number; tank_id: number; tank_name: string; membership_id: number; member_name: string; quantity_liters: string;
  window_start: Date; window_end: Date; status: ReservationStatus; closed_at: Date | null; created_at: Date; draw_id: number | null;
}

const RES_SELECT = `SELECT r.id, r.tank_id, t.name AS tank_name, r.membership_id, u.name AS member_name, r.quantity_liters, r.window_start, r.window_end,
    r.status, r.closed_at, r.created_at, d.id AS draw_id
  FROM reservations r
  JOIN tanks t ON t.id = r.tank_id AND t.coop_id = r.coop_id
  JOIN memberships m ON m.id = r.membership_id
  JOIN users u ON u.id = m.user_id
  LEFT JOIN draws d ON d.reservation_id = r.id AND d.reverses_draw_id IS NULL AND d.coop_id = r.coop_id`;

function resDto(r: ResRow, actor: Actor): ReservationDto {
  const qMl = litersToMl(r.quantity_liters);
  const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
  return {
    id: r.id, tankId: r.tank_id, tankName: r.tank_name, membershipId: r.membership_id, memberName: r.member_name,
    quantityLiters: qMl / 1000, quantity: mlToUnits3(qMl, actor.coop.units),
    windowStart: iso(r.window_start)!, windowEnd: iso(r.window_end)!, status: r.status, closedAt: iso(r.closed_at), createdAt: iso(r.created_at)!, drawId: r.draw_id,
  };
}
