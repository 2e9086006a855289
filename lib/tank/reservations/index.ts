import 'server-only';
import type { reservationSchema } from '@/lib/api/dto/tank';
import { fn, Op, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { audit, auditApiTokenId } from '@/lib/audit';
import { can, type Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, notFound, invalidFields } from '@/lib/http';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnits3, mlToUnitsFloor, coveredMl, tankAvailableMl } from '@/lib/tank/volume';
import type { reservationCreateSchema, reservationListSchema } from '@/lib/validation/tank';
import { Draw, Membership, Reservation, Tank, User } from '@/models';
import type { ReservationStatus } from '@/models/Reservation';
import { expireLapsedReservations, hasLapsedReservations } from './expire';
import { addReservedLiters, cancelFuel, reserveFuel, type ReservationColumns } from './queries';
import { parseWindowEdge, reservationWindow } from './window';

export { expireLapsedReservations };

export type { ReservationStatus } from '@/models/Reservation';

export type ReservationDto = z.infer<typeof reservationSchema>;

/** The 409 body when a tank cannot cover a request: how much is available, in litres and co-op units. */
function notEnough(actor: Actor, tankName: string, requestedMl: number, availableMl: number) {
  const units = actor.coop.units;
  return new HttpError(
    409,
    `${tankName} has only ${formatMl(availableMl, units, { floor: true, digits: 3 })} available, less than the ${formatMl(requestedMl, units, { digits: 3 })} you asked for.`,
    { quantity: [`At most ${formatMl(availableMl, units, { floor: true, digits: 3 })} is available.`] },
    {
      availableLiters: availableMl / 1000,
      available: mlToUnitsFloor(availableMl, units),
      unit: units === 'us' ? 'gal' : 'L',
    },
  );
}

/**
 * Reserves fuel for the signed-in member (never for anyone else: the body has no member field).
 * The tank can never be oversold: the quantity is added to the tank's reserved total by one
 * guarded UPDATE (lib/tank/reservations/queries) that succeeds only while on hand − reserved still
 * covers it, judged on the row being updated; its row lock makes concurrent reservations of the
 * same tank take turns, each seeing the one before, so two members cannot both take the last
 * gallons. When the guard refuses, the tank is read under its lock: a request over by no more
 * than the rounding crumb is trimmed to exactly what is left; otherwise → 409 with what is
 * available, and nothing is kept. (A CHECK reserved ≤ on hand backs this up in the table.)
 * Lapsed reservations of the co-op are marked expired first (in their own transaction, only when
 * there are any), so the fuel they held can be reserved again.
 */
export async function createReservation(
  actor: Actor,
  input: z.infer<typeof reservationCreateSchema>,
): Promise<ReservationDto> {
  const units = actor.coop.units;
  const coopId = actor.coop.id;
  const window = reservationWindow(input.windowStart, input.windowEnd, actor.coop.timezone);
  if (!window.ok) throw invalidFields(window.fields);
  const qMl = milliUnitsToMl(input.quantity, units);
  if (qMl <= 0) throw invalidFields({ quantity: ['Enter a quantity greater than zero.'] });
  const auditAfter = (liters: string) => ({
    tankId: input.tankId,
    membershipId: actor.membershipId,
    quantityLiters: liters,
    windowStart: window.start,
    windowEnd: window.end,
  });
  // The common case in one statement (guarded update, reservation, audit); lapsed reservations
  // are expired first only when there are any.
  if (await hasLapsedReservations(coopId)) await inTransaction((t) => expireLapsedReservations(coopId, t));
  const fast = await reserveFuel({
    coopId,
    tankId: input.tankId,
    membershipId: actor.membershipId,
    userId: actor.user.id,
    apiTokenId: auditApiTokenId(),
    liters: mlToLiters(qMl),
    windowStart: window.start,
    windowEnd: window.end,
    audit: auditAfter(mlToLiters(qMl)),
  });
  // Refused: find out why under the tank's lock; within the rounding crumb, take what is there.
  const created = fast
    ? { id: fast.id, createdAt: fast.createdAt, tankName: fast.tankName, liters: mlToLiters(qMl) }
    : await inTransaction(async (transaction) => {
        const cur = await Tank.findOne({
          attributes: ['name', 'active', 'onHandLiters', 'reservedLiters', 'heldLiters'],
          where: { id: input.tankId, coopId },
          lock: transaction.LOCK.UPDATE,
          transaction,
          raw: true,
        });
        if (!cur || !cur.active)
          throw invalidFields({
            tankId: ['Choose one of the co-op’s tanks that is in service.'],
          });
        // Fuel of a batch under review is held: not available to reserve.
        const availableMl = tankAvailableMl(
          litersToMl(cur.onHandLiters),
          litersToMl(cur.reservedLiters),
          litersToMl(cur.heldLiters),
        );
        const coveredQMl = coveredMl(qMl, availableMl, units);
        if (coveredQMl === null) throw notEnough(actor, cur.name, qMl, availableMl);
        const liters = mlToLiters(coveredQMl);
        const tank = await addReservedLiters(coopId, input.tankId, liters, transaction);
        if (!tank) throw notEnough(actor, cur.name, qMl, availableMl);
        const r = await Reservation.create(
          {
            coopId,
            tankId: tank.id,
            membershipId: actor.membershipId,
            quantityLiters: liters,
            windowStart: window.start,
            windowEnd: window.end,
          },
          { transaction },
        );
        await audit(
          {
            coopId,
            actorUserId: actor.user.id,
            action: 'reservation.create',
            entityType: 'reservation',
            entityId: r.id,
            after: auditAfter(liters),
          },
          transaction,
        );
        return { id: r.id, createdAt: r.createdAt, tankName: tank.name, liters };
      });
  return resDto(
    {
      id: created.id,
      tankId: input.tankId,
      membershipId: actor.membershipId,
      quantityLiters: created.liters,
      windowStart: window.start,
      windowEnd: window.end,
      status: 'open',
      closedAt: null,
      createdAt: created.createdAt,
      tank: { name: created.tankName },
      membership: { user: { name: actor.user.name } },
      draw: { id: null },
    },
    actor,
  );
}

/**
 * Cancels an open reservation and gives its quantity back to the tank, in one statement
 * (lib/tank/reservations/queries cancelFuel). A member cancels their own; brewers and admins
 * (draws:record) may cancel anyone's. Someone else's → 404; one no longer open, or whose window
 * has ended (expired, whether or not a write has marked it yet) → 409 naming its status.
 */
export async function cancelReservation(actor: Actor, reservationId: number): Promise<ReservationDto> {
  const coopId = actor.coop.id;
  const anyone = can(actor.role, 'draws:record');
  const r = await cancelFuel({
    coopId,
    reservationId,
    membershipId: actor.membershipId,
    anyone,
    userId: actor.user.id,
    apiTokenId: auditApiTokenId(),
  });
  if (r)
    return resDto(
      { ...r, tank: { name: r.tankName }, membership: { user: { name: r.memberName } }, draw: { id: null } },
      actor,
    );
  // Nothing cancelled: say why.
  const cur = await Reservation.findOne({
    attributes: ['membershipId', 'status', 'windowEnd'],
    where: { id: reservationId, coopId },
    raw: true,
  });
  if (!cur || (cur.membershipId !== actor.membershipId && !anyone)) throw notFound('Reservation not found.');
  const status = cur.status === 'open' && new Date(cur.windowEnd).getTime() < Date.now() ? 'expired' : cur.status;
  throw conflict(`This reservation is already ${status}; only an open reservation can be cancelled.`, { status });
}

const RES_SORT = {
  created_at: 'createdAt',
  window_end: 'windowEnd',
  quantity: 'quantityLiters',
  status: 'status',
} as const;

/** An open reservation whose window has ended counts as expired, whether or not a write has marked it yet. */
const LAPSED = { status: 'open', windowEnd: { [Op.lt]: fn('now') } } as const;

/** The where clause for a status as members see it (see {@link LAPSED}). */
function statusWhere(status: ReservationStatus): WhereOptions<Reservation> {
  if (status === 'open') return { status: 'open', windowEnd: { [Op.gte]: fn('now') } };
  if (status === 'expired') return { [Op.or]: [{ status: 'expired' }, LAPSED] };
  return { status };
}

/** A reservation as the lists read it (raw, nested includes). */
type ResListRow = ReservationColumns & {
  tank: { name: string };
  membership: { user: { name: string } };
  draw: { id: number | null };
};

const RES_ATTRIBUTES = [
  'id',
  'tankId',
  'membershipId',
  'quantityLiters',
  'windowStart',
  'windowEnd',
  'status',
  'closedAt',
  'createdAt',
] as const satisfies readonly (keyof ReservationColumns)[];

/** Tank name, member name, and the draw that closed it (not a reversal), in the same query. */
const resInclude = (coopId: number) => [
  { model: Tank, as: 'tank', attributes: ['name'], where: { coopId }, required: true },
  {
    model: Membership,
    as: 'membership',
    attributes: [],
    required: true,
    include: [{ model: User, as: 'user', attributes: ['name'], required: true }],
  },
  { model: Draw, as: 'draw', attributes: ['id'], where: { coopId, reversesDrawId: null }, required: false },
];

/**
 * Reservations of the co-op, a page at a time. Members see only their own; brewers, treasurers
 * and admins (draws:read-all) see everyone's and may filter by member. A lapsed reservation is
 * shown (and filtered) as expired; the read writes nothing.
 */
export async function listReservations(
  actor: Actor,
  q: z.infer<typeof reservationListSchema>,
  opts: { own?: boolean } = {},
) {
  const own = opts.own || !can(actor.role, 'draws:read-all');
  const tz = actor.coop.timezone;
  const conds: WhereOptions<Reservation>[] = [{ coopId: actor.coop.id }];
  if (own) conds.push({ membershipId: actor.membershipId });
  else if (q.membershipId) conds.push({ membershipId: q.membershipId });
  if (q.status) conds.push(statusWhere(q.status as ReservationStatus));
  if (q.tankId) conds.push({ tankId: q.tankId });
  const from = q.from ? parseWindowEdge(q.from, tz, false) : null;
  const to = q.to ? parseWindowEdge(q.to, tz, true) : null;
  if (from) conds.push({ windowEnd: { [Op.gt]: from } });
  if (to) conds.push({ windowStart: { [Op.lt]: to } });
  const where = { [Op.and]: conds };
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const [rows, total] = await Promise.all([
    Reservation.findAll({
      attributes: [...RES_ATTRIBUTES],
      where,
      include: resInclude(actor.coop.id),
      order: [
        [RES_SORT[q.sort as keyof typeof RES_SORT], dir],
        ['id', 'DESC'],
      ],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
      raw: true,
      nest: true,
    }) as unknown as Promise<ResListRow[]>,
    Reservation.count({ where }),
  ]);
  return { items: rows.map((r) => resDto(r, actor)), page: q.page, pageSize: q.pageSize, total };
}

/** One reservation (own, or anyone's for draws:read-all roles); 404 otherwise. */
export async function getReservation(actor: Actor, id: number): Promise<ReservationDto> {
  const row = (await Reservation.findOne({
    attributes: [...RES_ATTRIBUTES],
    where: { id, coopId: actor.coop.id },
    include: resInclude(actor.coop.id),
    raw: true,
    nest: true,
  })) as unknown as ResListRow | null;
  if (!row || (row.membershipId !== actor.membershipId && !can(actor.role, 'draws:read-all')))
    throw notFound('Reservation not found.');
  return resDto(row, actor);
}

function resDto(r: ResListRow, actor: Actor): ReservationDto {
  const qMl = litersToMl(r.quantityLiters);
  const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
  // Lapsed but not yet marked: shown as what it is (expired when its window ended).
  const lapsed = r.status === 'open' && new Date(r.windowEnd).getTime() < Date.now();
  return {
    id: r.id,
    tankId: r.tankId,
    tankName: r.tank.name,
    membershipId: r.membershipId,
    memberName: r.membership.user.name,
    quantityLiters: qMl / 1000,
    quantity: mlToUnits3(qMl, actor.coop.units),
    windowStart: iso(r.windowStart)!,
    windowEnd: iso(r.windowEnd)!,
    status: lapsed ? 'expired' : r.status,
    closedAt: lapsed ? iso(r.windowEnd) : iso(r.closedAt),
    createdAt: iso(r.createdAt)!,
    drawId: r.draw?.id ?? null,
  };
}
