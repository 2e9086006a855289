import 'server-only';
import type { dipResultSchema, movementSchema, tankSchema } from '@/lib/api/dto/tank';
import { literal, UniqueConstraintError, type InferAttributes, type Order, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, notFound } from '@/lib/http';
import { roundHalfUp } from '@/lib/money';
import { expireLapsedReservations } from '@/lib/reservations/expire';
import { LITERS_PER_US_GALLON, type UnitSystem } from '@/lib/units';
import type { dipCreateSchema, movementListSchema, tankCreateSchema, tankUpdateSchema, transferCreateSchema } from '@/lib/validation/tank';
import { Coop, DipReading, Draw, Membership, Tank, TankMovement, User } from '@/models';
import { recordMovement, type MovementKind } from './ledger';
import { refreshHeld } from './lineage';
import { litersToMl, mlToLiters } from './quantity';
import { formatMl, milliUnitsToMl, mlToUnits, mlToUnits3, mlToUnitsFloor, roundingCrumbMl } from './volume';

/** A tank as the screens and JSON see it: litres as stored, and the same in the co-op's unit. */
export type TankDto = z.infer<typeof tankSchema>;

/**
 * A tank row as the list reads it: the stored totals, plus the litres of its reservations that
 * are still open but whose window has ended (not yet marked expired by a write) and the time of
 * its last dip. NUMERIC and BIGINT arrive as strings.
 */
export type TankListRow = Pick<InferAttributes<Tank>, 'id' | 'name' | 'active' | 'capacityLiters' | 'onHandLiters' | 'reservedLiters' | 'heldLiters' | 'mixing' | 'valueCents'> & {
  lapsedLiters: string;
  lastDipAt: Date | null;
};

// Correlated subqueries on the tank row. The main table's alias is the model's name, which the
// production build minifies, so it is taken from the class rather than written out. Both are
// index scans: reservations_open_window (coop_id, window_end) WHERE status = 'open', and
// dip_readings_coop_tank (coop_id, tank_id, measured_at DESC).
const T = `"${Tank.name}"`;
const LAPSED_LITERS = literal(`(SELECT coalesce(sum(r.quantity_liters), 0) FROM reservations r
  WHERE r.coop_id = ${T}.coop_id AND r.status = 'open' AND r.window_end < now() AND r.tank_id = ${T}.id)`);
const LAST_DIP_AT = literal(`(SELECT max(d.measured_at) FROM dip_readings d WHERE d.coop_id = ${T}.coop_id AND d.tank_id = ${T}.id)`);
const TANK_ORDER: Order = [['active', 'DESC'], ['id', 'ASC']];

/**
 * The tank list's one query: a co-op's tanks (optionally only those in service, or one by id)
 * with their totals, their lapsed-but-still-open reservations and their last dip. It writes
 * nothing: reserved is reported net of lapsed reservations, which a later write marks expired.
 * The bench route runs exactly this query.
 */
export async function findTankRows(coopId: number, opts: { activeOnly?: boolean; tankId?: number } = {}): Promise<TankListRow[]> {
  const where: WhereOptions<Tank> = { coopId };
  if (opts.activeOnly) where.active = true;
  if (opts.tankId !== undefined) where.id = opts.tankId;
  const rows = await Tank.findAll({
    attributes: ['id', 'name', 'active', 'capacityLiters', 'onHandLiters', 'reservedLiters', 'heldLiters', 'mixing', 'valueCents', [LAPSED_LITERS, 'lapsedLiters'], [LAST_DIP_AT, 'lastDipAt']],
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
  const availableMl = Math.max(0, onHandMl - reservedMl - heldMl);
  const valueCents = Number(r.valueCents);
  const perGallon = onHandMl > 0 ? (valueCents / onHandMl) * 1000 * LITERS_PER_US_GALLON : null;
  const perUnit = onHandMl > 0 ? valueCents / mlToUnits(onHandMl, units) : null;
  const r2 = (v: number | null) => (v === null ? null : Math.round(v * 100) / 100);
  return {
    id: r.id, name: r.name, active: r.active, units,
    capacityLiters: capacityMl / 1000, onHandLiters: onHandMl / 1000, reservedLiters: reservedMl / 1000, heldLiters: heldMl / 1000, availableLiters: availableMl / 1000,
    capacity: mlToUnits3(capacityMl, units), onHand: mlToUnits3(onHandMl, units), reserved: mlToUnits3(reservedMl, units), held: mlToUnits3(heldMl, units),
    available: mlToUnitsFloor(availableMl, units), mixing: r.mixing,
    valueCents, avgCostCentsPerGallon: r2(perGallon), avgCostCentsPerUnit: r2(perUnit),
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

const nameTaken = () => new HttpError(422, 'Some fields need attention.', { name: ['Another tank in this co-op already has that name.'] });

/** Creates an empty tank (brewer/admin). Capacity is in the co-op's unit. */
export async function createTank(actor: Actor, input: z.infer<typeof tankCreateSchema>): Promise<TankDto> {
  const capacityMl = milliUnitsToMl(input.capacity, actor.coop.units);
  try {
    const tank = await inTransaction(async (transaction) => {
      const t = await Tank.create({ coopId: actor.coop.id, name: input.name, capacityLiters: mlToLiters(capacityMl) }, { transaction });
      await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'tank.create', entityType: 'tank', entityId: t.id, after: { name: t.name, capacityLiters: t.capacityLiters } }, transaction);
      return t;
    });
    return getTank(actor, tank.id);
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw nameTaken();
    throw e;
  }
}

/** Renames a tank, changes its capacity, or takes it out of (or back into) service. */
export async function updateTank(actor: Actor, tankId: number, input: z.infer<typeof tankUpdateSchema>): Promise<TankDto> {
  try {
    await inTransaction(async (transaction) => {
      if (input.active === false) await expireLapsedReservations(actor.coop.id, transaction);
      const tank = await Tank.findOne({ where: { id: tankId, coopId: actor.coop.id }, lock: transaction.LOCK.UPDATE, transaction });
      if (!tank) throw notFound('Tank not found.');
      const before = { name: tank.name, capacityLiters: tank.capacityLiters, active: tank.active, mixing: tank.mixing };
      const onHandMl = litersToMl(tank.onHandLiters);
      if (input.capacity !== undefined) {
        const capacityMl = milliUnitsToMl(input.capacity, actor.coop.units);
        if (capacityMl < onHandMl) {
          throw new HttpError(422, 'Some fields need attention.', { capacity: [`The tank already holds ${formatMl(onHandMl, actor.coop.units)}; the capacity cannot be less.`] });
        }
        tank.capacityLiters = mlToLiters(capacityMl);
      }
      if (input.name !== undefined) tank.name = input.name;
      if (input.active === false && tank.active) {
        if (onHandMl > 0 || litersToMl(tank.reservedLiters) > 0) {
          throw conflict(`${tank.name} still holds ${formatMl(onHandMl, actor.coop.units)}. Draw or transfer its fuel (and let its reservations close) before taking it out of service.`);
        }
      }
      if (input.active !== undefined) tank.active = input.active;
      if (input.mixing !== undefined) tank.mixing = input.mixing;
      await tank.save({ transaction });
      // Held fuel depends on the model (a well-mixed tank holds all of it while a batch in it is under review).
      if (input.mixing !== undefined && input.mixing !== before.mixing) await refreshHeld(transaction, actor.coop.id, tank.id);
      await audit({
        coopId: actor.coop.id, actorUserId: actor.user.id, action: 'tank.update', entityType: 'tank', entityId: tank.id, before,
        after: { name: tank.name, capacityLiters: tank.capacityLiters, active: tank.active, mixing: tank.mixing },
      }, transaction);
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw nameTaken();
    throw e;
  }
  return getTank(actor, tankId);
}

/** The tank columns a write path reads under its row lock. */
export type LockedTank = Pick<InferAttributes<Tank>, 'id' | 'name' | 'active' | 'capacityLiters' | 'onHandLiters' | 'reservedLiters' | 'heldLiters' | 'valueCents'>;

/** Locks a tank row of the co-op for the rest of the transaction (404 when not the co-op's). */
export async function lockTank(coopId: number, tankId: number, transaction: Transaction): Promise<LockedTank> {
  const row = await Tank.findOne({
    attributes: ['id', 'name', 'active', 'capacityLiters', 'onHandLiters', 'reservedLiters', 'heldLiters', 'valueCents'],
    where: { id: tankId, coopId },
    lock: transaction.LOCK.UPDATE,
    transaction,
    raw: true,
  });
  if (!row) throw notFound('Tank not found.');
  return row;
}

export type DipResult = z.infer<typeof dipResultSchema>;

/**
 * Records a dip reading: the measured volume against the book figure. A difference becomes one
 * 'dip-adjustment' ledger row with its reason (a gain is valued at `unitCost` when given, e.g. an
 * opening balance, otherwise at the tank's average cost; a loss leaves at average cost). The
 * reading may not fall below what members have reserved (409). Lapsed reservations are marked
 * expired first, so they no longer count.
 */
export async function recordDip(actor: Actor, tankId: number, input: z.infer<typeof dipCreateSchema>): Promise<DipResult> {
  const units = actor.coop.units;
  const result = await inTransaction(async (transaction) => {
    await expireLapsedReservations(actor.coop.id, transaction);
    const tank = await lockTank(actor.coop.id, tankId, transaction);
    if (!tank.active) throw conflict(`${tank.name} is out of service; put it back in service before recording a dip.`);
    const measuredMl = milliUnitsToMl(input.measured, units);
    const bookMl = litersToMl(tank.onHandLiters);
    const reservedMl = litersToMl(tank.reservedLiters);
    const capacityMl = litersToMl(tank.capacityLiters);
    const diffMl = measuredMl - bookMl;
    if (measuredMl > capacityMl) {
      throw new HttpError(422, 'Some fields need attention.', { measured: [`${tank.name} holds at most ${formatMl(capacityMl, units)}. Check the reading, or correct the tank's capacity first.`] });
    }
    if (diffMl !== 0 && !input.reason) {
      throw new HttpError(422, 'Some fields need attention.', { reason: ['Say why the tank differs from the book (e.g. evaporation, a spill, meter drift).'] });
    }
    if (diffMl < 0 && measuredMl < reservedMl) {
      throw new HttpError(
        409,
        `The reading (${formatMl(measuredMl, units)}) is below what members have reserved (${formatMl(reservedMl, units)}). Cancel or draw reservations first, or check the reading.`,
        { measured: ['Below the reserved amount.'] },
        { reservedLiters: reservedMl / 1000, reserved: mlToUnits3(reservedMl, units) },
      );
    }
    let movementId: string | null = null;
    if (diffMl !== 0) {
      const valueCents = diffMl > 0 && input.unitCost !== undefined
        ? roundHalfUp((input.unitCost * mlToUnits(diffMl, units)))
        : undefined;
      const moved = await recordMovement(transaction, {
        coopId: actor.coop.id, tankId, kind: 'dip-adjustment', quantityMl: diffMl, valueCents, reason: input.reason ?? null, userId: actor.user.id,
      });
      movementId = moved.id;
    }
    const dip = await DipReading.create(
      { coopId: actor.coop.id, tankId, measuredLiters: mlToLiters(measuredMl), bookLiters: mlToLiters(bookMl), movementId, reason: input.reason ?? null, createdByUserId: actor.user.id },
      { transaction },
    );
    await audit({
      coopId: actor.coop.id, actorUserId: actor.user.id, action: 'tank.dip', entityType: 'tank', entityId: tankId,
      before: { onHandLiters: mlToLiters(bookMl) }, after: { onHandLiters: mlToLiters(measuredMl), differenceLiters: mlToLiters(diffMl), reason: input.reason ?? null, movementId },
    }, transaction);
    return { dipReadingId: dip.id, diffMl, movementId };
  });
  return {
    tank: await getTank(actor, tankId), dipReadingId: result.dipReadingId, movementId: result.movementId,
    differenceLiters: result.diffMl / 1000, difference: mlToUnits3(result.diffMl, units),
  };
}

/**
 * Moves fuel between two tanks of the co-op: two ledger rows in one transaction; the value
 * leaves the source at its average cost and arrives with the fuel. Only available fuel moves
 * (reserved fuel stays), and the destination's capacity is respected.
 */
export async function transferFuel(actor: Actor, input: z.infer<typeof transferCreateSchema>): Promise<{ from: TankDto; to: TankDto }> {
  const units = actor.coop.units;
  let qMl = milliUnitsToMl(input.quantity, units);
  await inTransaction(async (transaction) => {
    await expireLapsedReservations(actor.coop.id, transaction);
    // Lock in id order so two opposite transfers cannot deadlock.
    const [firstId, secondId] = input.fromTankId < input.toTankId ? [input.fromTankId, input.toTankId] : [input.toTankId, input.fromTankId];
    const first = await lockTank(actor.coop.id, firstId, transaction).catch(() => null);
    const second = await lockTank(actor.coop.id, secondId, transaction).catch(() => null);
    const from = first?.id === input.fromTankId ? first : second;
    const to = first?.id === input.toTankId ? first : second;
    const fields: Record<string, string[]> = {};
    if (!from) fields.fromTankId = ['No such tank in this co-op.'];
    if (!to) fields.toTankId = ['No such tank in this co-op.'];
    if (!from || !to) throw new HttpError(422, 'Some fields need attention.', fields);
    if (!from.active || !to.active) throw conflict(`${!from.active ? from.name : to.name} is out of service.`);
    const availableMl = litersToMl(from.onHandLiters) - litersToMl(from.reservedLiters) - litersToMl(from.heldLiters);
    if (qMl > availableMl && qMl - availableMl <= roundingCrumbMl(units) && availableMl > 0) qMl = availableMl;
    if (qMl > availableMl) {
      throw new HttpError(409, `${from.name} has only ${formatMl(Math.max(0, availableMl), units, { floor: true })} available to move (reserved fuel and fuel held for a batch review stay put).`, { quantity: ['More than is available.'] }, {
        availableLiters: availableMl / 1000, available: mlToUnitsFloor(availableMl, units),
      });
    }
    const roomMl = litersToMl(to.capacityLiters) - litersToMl(to.onHandLiters);
    if (qMl > roomMl) {
      throw new HttpError(409, `${to.name} has room for only ${formatMl(roomMl, units, { floor: true })}.`, { quantity: ['More than the destination can hold.'] });
    }
    const out = await recordMovement(transaction, { coopId: actor.coop.id, tankId: from.id, kind: 'transfer-out', quantityMl: -qMl, transferTankId: to.id, reason: input.reason ?? null, userId: actor.user.id });
    const inn = await recordMovement(transaction, {
      coopId: actor.coop.id, tankId: to.id, kind: 'transfer-in', quantityMl: qMl, valueCents: -out.valueCents, transferTankId: from.id, reason: input.reason ?? null, userId: actor.user.id,
      lineage: { kind: 'shares', shares: out.shares },
    });
    await audit({
      coopId: actor.coop.id, actorUserId: actor.user.id, action: 'tank.transfer', entityType: 'tank', entityId: from.id,
      before: { fromOnHandLiters: from.onHandLiters, toOnHandLiters: to.onHandLiters },
      after: { toTankId: to.id, quantityLiters: mlToLiters(qMl), valueCents: -out.valueCents, movementIds: [out.id, inn.id] },
    }, transaction);
  });
  return { from: await getTank(actor, input.fromTankId), to: await getTank(actor, input.toTankId) };
}

export type MovementDto = z.infer<typeof movementSchema>;

/** A ledger row as the list reads it (raw, nested includes). */
type MovementListRow = Pick<InferAttributes<TankMovement>,
  'id' | 'kind' | 'quantityLiters' | 'valueCents' | 'onHandAfterLiters' | 'valueAfterCents' | 'reason' | 'batchId' | 'drawId' | 'occurredAt'> & {
  createdBy: { name: string | null };
  transferTank: { name: string | null };
  draw: { membership: { user: { name: string | null } } };
};

const MOVEMENT_SORT = { recorded: 'id', occurred_at: 'occurredAt', quantity: 'quantityLiters', kind: 'kind' } as const;

/**
 * A tank's ledger, a page at a time, sorted on the server (default: newest first as recorded).
 * @param actor brewer, treasurer or admin (draws:read-all)
 */
export async function listMovements(actor: Actor, tankId: number, q: z.infer<typeof movementListSchema>) {
  const units = actor.coop.units;
  const coopId = actor.coop.id;
  const where: WhereOptions<TankMovement> = { coopId, tankId };
  if (q.kind) where.kind = q.kind as MovementKind;
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const [tank, rows, total] = await Promise.all([
    Tank.findOne({ attributes: ['id'], where: { id: tankId, coopId }, raw: true }),
    TankMovement.findAll({
      attributes: ['id', 'kind', 'quantityLiters', 'valueCents', 'onHandAfterLiters', 'valueAfterCents', 'reason', 'batchId', 'drawId', 'occurredAt'],
      where,
      include: [
        { model: User, as: 'createdBy', attributes: ['name'] },
        { model: Tank, as: 'transferTank', attributes: ['name'], where: { coopId }, required: false },
        {
          model: Draw, as: 'draw', attributes: [], where: { coopId }, required: false,
          include: [{ model: Membership, as: 'membership', attributes: [], include: [{ model: User, as: 'user', attributes: ['name'] }] }],
        },
      ],
      order: [[MOVEMENT_SORT[q.sort as keyof typeof MOVEMENT_SORT], dir], ['id', dir]],
      limit: q.pageSize,
      offset: (q.page - 1) * q.pageSize,
      raw: true,
      nest: true,
    }) as unknown as Promise<MovementListRow[]>,
    TankMovement.count({ where }),
  ]);
  if (!tank) throw notFound('Tank not found.');
  const items: MovementDto[] = rows.map((r) => {
    const qMl = litersToMl(r.quantityLiters);
    const afterMl = litersToMl(r.onHandAfterLiters);
    return {
      id: r.id, kind: r.kind, quantityLiters: qMl / 1000, quantity: mlToUnits3(qMl, units), valueCents: Number(r.valueCents),
      onHandAfterLiters: afterMl / 1000, onHandAfter: mlToUnits3(afterMl, units), valueAfterCents: Number(r.valueAfterCents),
      reason: r.reason, batchId: r.batchId, drawId: r.drawId, memberName: r.draw?.membership?.user?.name ?? null,
      transferTankName: r.transferTank?.name ?? null, byName: r.createdBy?.name ?? null,
      occurredAt: new Date(r.occurredAt).toISOString(),
    };
  });
  return { items, page: q.page, pageSize: q.pageSize, total };
}
