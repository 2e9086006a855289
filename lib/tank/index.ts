import 'server-only';
import type { tankSchema } from '@/lib/api/dto/tank';
import {
  literal,
  UniqueConstraintError,
  type InferAttributes,
  type Order,
  type Transaction,
  type WhereOptions,
} from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, notFound, invalidFields } from '@/lib/http';
import { expireLapsedReservations } from '@/lib/tank/reservations/expire';
import { lapsedLitersSql } from '@/lib/tank/reservations/queries';
import { LITERS_PER_US_GALLON, type UnitSystem } from '@/lib/units';
import type { tankCreateSchema, tankUpdateSchema } from '@/lib/validation/tank';
import { Coop, Tank } from '@/models';
import { refreshHeld } from './lineage';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnits, mlToUnits3, mlToUnitsFloor, tankAvailableMl } from './volume';

// Tanks: the list and one tank as read, creating and changing a tank, and the row lock every
// write path takes. Dips, transfers and the ledger list are in ./dips, ./transfers, ./movements.

/** A tank as the screens and JSON see it: litres as stored, and the same in the co-op's unit. */
export type TankDto = z.infer<typeof tankSchema>;

/**
 * A tank row as the list reads it: the stored totals, plus the litres of its reservations that
 * are still open but whose window has ended (not yet marked expired by a write) and the time of
 * its last dip. NUMERIC and BIGINT arrive as strings.
 */
export type TankListRow = Pick<
  InferAttributes<Tank>,
  | 'id'
  | 'name'
  | 'active'
  | 'capacityLiters'
  | 'onHandLiters'
  | 'reservedLiters'
  | 'heldLiters'
  | 'mixing'
  | 'valueCents'
> & {
  lapsedLiters: string;
  lastDipAt: Date | null;
};

// Correlated subqueries on the tank row. The main table's alias is the model's name, which the
// production build minifies, so it is taken from the class rather than written out. Both are
// index scans: reservations_open_window (coop_id, window_end) WHERE status = 'open', and
// dip_readings_coop_tank (coop_id, tank_id, measured_at DESC).
const T = `"${Tank.name}"`;
const LAPSED_LITERS = literal(lapsedLitersSql(T));
const LAST_DIP_AT = literal(
  `(SELECT max(d.measured_at) FROM dip_readings d WHERE d.coop_id = ${T}.coop_id AND d.tank_id = ${T}.id)`,
);
const TANK_ORDER: Order = [
  ['active', 'DESC'],
  ['id', 'ASC'],
];

/**
 * The tank list's one query: a co-op's tanks (optionally only those in service, or one by id)
 * with their totals, their lapsed-but-still-open reservations and their last dip. It writes
 * nothing: reserved is reported net of lapsed reservations, which a later write marks expired.
 * The bench route runs exactly this query.
 */
export async function findTankRows(
  coopId: number,
  opts: { activeOnly?: boolean; tankId?: number } = {},
): Promise<TankListRow[]> {
  const where: WhereOptions<Tank> = { coopId };
  if (opts.activeOnly) where.active = true;
  if (opts.tankId !== undefined) where.id = opts.tankId;
  const rows = await Tank.findAll({
    attributes: [
      'id',
      'name',
      'active',
      'capacityLiters',
      'onHandLiters',
      'reservedLiters',
      'heldLiters',
      'mixing',
      'valueCents',
      [LAPSED_LITERS, 'lapsedLiters'],
      [LAST_DIP_AT, 'lastDipAt'],
    ],
    where,
    order: TANK_ORDER,
    raw: true,
  });
  return rows as unknown as TankListRow[];
}

const benchCoopIds = new Map<string, number>();

/**
 * For the bench-only route: a co-op id from an id or a slug (a slug is looked up once per
 * process, so the measured request runs only the tank query). Null when unknown.
 */
export async function findCoopIdForBench(idOrSlug: string): Promise<number | null> {
  if (/^[1-9]\d{0,8}$/.test(idOrSlug)) return Number(idOrSlug);
  const known = benchCoopIds.get(idOrSlug);
  if (known !== undefined) return known;
  const coop = await Coop.findOne({ attributes: ['id'], where: { slug: idOrSlug }, raw: true });
  if (coop) benchCoopIds.set(idOrSlug, coop.id);
  return coop?.id ?? null;
}

function tankDto(r: TankListRow, units: UnitSystem): TankDto {
  const onHandMl = litersToMl(r.onHandLiters);
  const reservedMl = litersToMl(r.reservedLiters) - litersToMl(r.lapsedLiters);
  const capacityMl = litersToMl(r.capacityLiters);
  const heldMl = litersToMl(r.heldLiters);
  const availableMl = tankAvailableMl(onHandMl, reservedMl, heldMl);
  const valueCents = Number(r.valueCents);
  const perGallon = onHandMl > 0 ? (valueCents / onHandMl) * 1000 * LITERS_PER_US_GALLON : null;
  const perUnit = onHandMl > 0 ? valueCents / mlToUnits(onHandMl, units) : null;
  const r2 = (v: number | null) => (v === null ? null : Math.round(v * 100) / 100);
  return {
    id: r.id,
    name: r.name,
    active: r.active,
    units,
    capacityLiters: capacityMl / 1000,
    onHandLiters: onHandMl / 1000,
    reservedLiters: reservedMl / 1000,
    heldLiters: heldMl / 1000,
    availableLiters: availableMl / 1000,
    capacity: mlToUnits3(capacityMl, units),
    onHand: mlToUnits3(onHandMl, units),
    reserved: mlToUnits3(reservedMl, units),
    held: mlToUnits3(heldMl, units),
    available: mlToUnitsFloor(availableMl, units),
    mixing: r.mixing,
    valueCents,
    avgCostCentsPerGallon: r2(perGallon),
    avgCostCentsPerUnit: r2(perUnit),
    lastDipAt: r.lastDipAt ? new Date(r.lastDipAt).toISOString() : null,
  };
}

/**
 * The co-op's tanks with on hand, reserved, available and average cost, in service first.
 * Reserved counts open reservations whose window has not ended; the read writes nothing.
 * @param actor any member (tank:read)
 */
export async function listTanks(actor: Actor, opts: { activeOnly?: boolean } = {}): Promise<TankDto[]> {
  return (await findTankRows(actor.coop.id, opts)).map((r) => tankDto(r, actor.coop.units));
}

/** One tank of the actor's co-op (404 for another co-op's or a missing id). */
export async function getTank(actor: Actor, tankId: number): Promise<TankDto> {
  const [row] = await findTankRows(actor.coop.id, { tankId });
  if (!row) throw notFound('Tank not found.');
  return tankDto(row, actor.coop.units);
}

const nameTaken = () => invalidFields({ name: ['Another tank in this co-op already has that name.'] });

/** Creates an empty tank (brewer/admin). Capacity is in the co-op's unit. */
export async function createTank(actor: Actor, input: z.infer<typeof tankCreateSchema>): Promise<TankDto> {
  const capacityMl = milliUnitsToMl(input.capacity, actor.coop.units);
  try {
    const tank = await inTransaction(async (transaction) => {
      const t = await Tank.create(
        { coopId: actor.coop.id, name: input.name, capacityLiters: mlToLiters(capacityMl) },
        { transaction },
      );
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'tank.create',
          entityType: 'tank',
          entityId: t.id,
          after: { name: t.name, capacityLiters: t.capacityLiters },
        },
        transaction,
      );
      return t;
    });
    return getTank(actor, tank.id);
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw nameTaken();
    throw e;
  }
}

/** Renames a tank, changes its capacity, or takes it out of (or back into) service. */
export async function updateTank(
  actor: Actor,
  tankId: number,
  input: z.infer<typeof tankUpdateSchema>,
): Promise<TankDto> {
  try {
    await inTransaction(async (transaction) => {
      if (input.active === false) await expireLapsedReservations(actor.coop.id, transaction);
      const tank = await Tank.findOne({
        where: { id: tankId, coopId: actor.coop.id },
        lock: transaction.LOCK.UPDATE,
        transaction,
      });
      if (!tank) throw notFound('Tank not found.');
      const before = { name: tank.name, capacityLiters: tank.capacityLiters, active: tank.active, mixing: tank.mixing };
      const onHandMl = litersToMl(tank.onHandLiters);
      if (input.capacity !== undefined) {
        const capacityMl = milliUnitsToMl(input.capacity, actor.coop.units);
        if (capacityMl < onHandMl) {
          throw invalidFields({
            capacity: [`The tank already holds ${formatMl(onHandMl, actor.coop.units)}; the capacity cannot be less.`],
          });
        }
        tank.capacityLiters = mlToLiters(capacityMl);
      }
      if (input.name !== undefined) tank.name = input.name;
      if (input.active === false && tank.active) {
        if (onHandMl > 0 || litersToMl(tank.reservedLiters) > 0) {
          throw conflict(
            `${tank.name} still holds ${formatMl(onHandMl, actor.coop.units)}. Draw or transfer its fuel (and let its reservations close) before taking it out of service.`,
          );
        }
      }
      if (input.active !== undefined) tank.active = input.active;
      if (input.mixing !== undefined) tank.mixing = input.mixing;
      await tank.save({ transaction });
      // Held fuel depends on the model (a well-mixed tank holds all of it while a batch in it is under review).
      if (input.mixing !== undefined && input.mixing !== before.mixing)
        await refreshHeld(transaction, actor.coop.id, tank.id);
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'tank.update',
          entityType: 'tank',
          entityId: tank.id,
          before,
          after: { name: tank.name, capacityLiters: tank.capacityLiters, active: tank.active, mixing: tank.mixing },
        },
        transaction,
      );
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw nameTaken();
    throw e;
  }
  return getTank(actor, tankId);
}

/** The tank columns a write path reads under its row lock. */
export type LockedTank = Pick<
  InferAttributes<Tank>,
  'id' | 'name' | 'active' | 'capacityLiters' | 'onHandLiters' | 'reservedLiters' | 'heldLiters' | 'valueCents'
>;

/** Locks a tank row of the co-op for the rest of the transaction (404 when not the co-op's). */
export async function lockTank(coopId: number, tankId: number, transaction: Transaction): Promise<LockedTank> {
  const row = await Tank.findOne({
    attributes: [
      'id',
      'name',
      'active',
      'capacityLiters',
      'onHandLiters',
      'reservedLiters',
      'heldLiters',
      'valueCents',
    ],
    where: { id: tankId, coopId },
    lock: transaction.LOCK.UPDATE,
    transaction,
    raw: true,
  });
  if (!row) throw notFound('Tank not found.');
  return row;
}
