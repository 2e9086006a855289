import 'server-only';
import { QueryTypes, UniqueConstraintError } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { runReadPlan, sequelize, statement, type ReadPlan } from '@/lib/db';
import { conflict, HttpError, notFound } from '@/lib/http';
import { roundHalfUp } from '@/lib/money';
import { EXPIRE_CTES, expireLapsedReservations } from '@/lib/reservations/expire';
import { LITERS_PER_US_GALLON, type UnitSystem } from '@/lib/units';
import type { dipCreateSchema, movementListSchema, tankCreateSchema, tankUpdateSchema, transferCreateSchema } from '@/lib/validation/tank';
import { DipReading, Tank } from '@/models';
import { recordMovement, type MovementKind } from './ledger';
import { litersToMl, mlToLiters } from './quantity';
import { inTransaction } from './tx';
import { formatMl, milliUnitsToMl, mlToUnits, mlToUnits3, mlToUnitsFloor, roundingCrumbMl } from './volume';

/** A tank as the screens and JSON see it: litres as stored, and the same in the co-op's unit. */
export interface TankDto {
  id: number;
  name: string;
  active: boolean;
  units: UnitSystem;
  capacityLiters: number;
  onHandLiters: number;
  reservedLiters: number;
  /** On hand − reserved. */
  availableLiters: number;
  /** In the co-op's unit (US gallons or litres), 3 decimals; available is rounded down. */
  capacity: number;
  onHand: number;
  reserved: number;
  available: number;
  /** Stock value at moving weighted-average cost, cents. */
  valueCents: number;
  /** value ÷ on hand, cents per US gallon (2 decimals), null when the tank is empty. */
  avgCostCentsPerGallon: number | null;
  /** The same per co-op unit (gallon or litre), null when empty. */
  avgCostCentsPerUnit: number | null;
  lastDipAt: string | null;
}

interface TankRow {
  id: number; name: string; active: boolean; capacity_liters: string; on_hand_liters: string; reserved_liters: string; value_cents: string;
  last_dip_at: Date | null;
}

function tankDto(r: TankRow, units: UnitSystem): TankDto {
  const onHandMl = litersToMl(r.on_hand_liters);
  const reservedMl = litersToMl(r.reserved_liters);
  const capacityMl = litersToMl(r.capacity_liters);
  const availableMl = onHandMl - reservedMl;
  const valueCents = Number(r.value_cents);
  const perGallon = onHandMl > 0 ? (valueCents / onHandMl) * 1000 * LITERS_PER_US_GALLON : null;
  const perUnit = onHandMl > 0 ? valueCents / mlToUnits(onHandMl, units) : null;
  const r2 = (v: number | null) => (v === null ? null : Math.round(v * 100) / 100);
  return {
    id: r.id, name: r.name, active: r.active, units,
    capacityLiters: capacityMl / 1000, onHandLiters: onHandMl / 1000, reservedLiters: reservedMl / 1000, availableLiters: availableMl / 1000,
    capacity: mlToUnits3(capacityMl, units), onHand: mlToUnits3(onHandMl, units), reserved: mlToUnits3(reservedMl, units), available: mlToUnitsFloor(availableMl, units),
    valueCents, avgCostCentsPerGallon: r2(perGallon), avgCostCentsPerUnit: r2(perUnit),
    lastDipAt: r.last_dip_at ? new Date(r.last_dip_at).toISOString() : null,
  };
}

const TANK_COLUMNS = `t.id, t.name, t.active, t.capacity_liters, t.on_hand_liters, t.value_cents,
  (SELECT max(d.measured_at) FROM dip_readings d WHERE d.coop_id = t.coop_id AND d.tank_id = t.id) AS last_dip_at`;

const listTanksStatement = (activeOnly: boolean) =>
  statement(
    `WITH ${EXPIRE_CTES}
     SELECT ${TANK_COLUMNS}, (t.reserved_liters - coalesce(p.liters, 0))::text AS reserved_liters
     FROM tanks t LEFT JOIN expired_per_tank p ON p.tank_id = t.id
     WHERE t.coop_id = $1 ${activeOnly ? 'AND t.active' : ''}
     ORDER BY t.active DESC, t.id`,
    activeOnly ? 'tv_list_active_tanks' : 'tv_list_tanks',
  );
const LIST_TANKS = listTanksStatement(false);
const LIST_ACTIVE_TANKS = listTanksStatement(true);

/**
 * The co-op's tanks with on hand, reserved, available and average cost. One statement: it
 * first expires lapsed reservations (lazy expiry) and reports reserved net of them. The tank
 * route sends it with the session check; the expiry is housekeeping that any read of the co-op's
 * tanks does, whoever asks.
 * @param actor any member (tank:read)
 */
export function listTanksPlan(actor: Actor, opts: { activeOnly?: boolean } = {}): ReadPlan<TankDto[]> {
  return {
    reads: [[opts.activeOnly ? LIST_ACTIVE_TANKS : LIST_TANKS, [actor.coop.id]]],
    finish: ([rows]) => (rows as TankRow[]).map((r) => tankDto(r, actor.coop.units)),
  };
}

/** The co-op's tanks (see {@link listTanksPlan}). */
export function listTanks(actor: Actor, opts: { activeOnly?: boolean } = {}): Promise<TankDto[]> {
  return runReadPlan(listTanksPlan(actor, opts));
}

/** One tank of the actor's co-op (404 for another co-op's or a missing id). */
export async function getTank(actor: Actor, tankId: number): Promise<TankDto> {
  const tank = (await listTanks(actor)).find((t) => t.id === tankId);
  if (!tank) throw notFound('Tank not found.');
  return tank;
}

const nameTaken = () => new HttpError(422, 'Some fields need attention.', { name: ['Another tank in this co-op already has that name.'] });

/** Creates an empty tank (brewer/admin). Capacity is in the co-op's unit. */
export async function createTank(actor: Actor, input: z.infer<typeof tankCreateSchema>): Promise<TankDto> {
  const capacityMl = milliUnitsToMl(input.capacity, actor.coop.units);
  try {
    const tank = await sequelize.transaction(async (transaction) => {
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
      const tank = await Tank.findOne({ where: { id: tankId, coopId: actor.coop.id }, lock: transaction.LOCK.UPDATE, transaction });
      if (!tank) throw notFound('Tank not found.');
      const before = { name: tank.name, capacityLiters: tank.capacityLiters, active: tank.active };
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
      await tank.save({ transaction });
      await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'tank.update', entityType: 'tank', entityId: tank.id, before, after: { name: tank.name, capacityLiters: tank.capacityLiters, active: tank.active } }, transaction);
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw nameTaken();
    throw e;
  }
  return getTank(actor, tankId);
}

interface LockedTank { id: number; name: string; active: boolean; capacity_liters: string; on_hand_liters: string; reserved_liters: string; value_cents: string }

/** Locks a tank row of the co-op for the rest of the transaction (404 when not the co-op's). */
export async function lockTank(coopId: number, tankId: number, transaction: import('sequelize').Transaction): Promise<LockedTank> {
  const [row] = await sequelize.query<LockedTank>(
    `SELECT id, name, active, capacity_liters, on_hand_liters, reserved_liters, value_cents FROM tanks WHERE id = :tankId AND coop_id = :coopId FOR UPDATE`,
    { replacements: { tankId, coopId }, type: QueryTypes.SELECT, transaction },
  );
  if (!row) throw notFound('Tank not found.');
  return row;
}

export interface DipResult {
  tank: TankDto;
  dipReadingId: number;
  /** Measured − book, millilitres and in the co-op's unit; 0 when the reading matched. */
  differenceLiters: number;
  difference: number;
  movementId: string | null;
}

/**
 * Records a dip reading: the measured volume against the book figure. A difference becomes one
 * 'dip-adjustment' ledger row with its reason (a gain is valued at `unitCost` when given, e.g. an
 * opening balance, otherwise at the tank's average cost; a loss leaves at average cost). The
 * reading may not fall below what members have reserved (409).
 */
export async function recordDip(actor: Actor, tankId: number, input: z.infer<typeof dipCreateSchema>): Promise<DipResult> {
  const units = actor.coop.units;
  const result = await inTransaction(async (transaction) => {
    await expireLapsedReservations(actor.coop.id, transaction);
    const tank = await lockTank(actor.coop.id, tankId, transaction);
    if (!tank.active) throw conflict(`${tank.name} is out of service; put it back in service before recording a dip.`);
    const measuredMl = milliUnitsToMl(input.measured, units);
    const bookMl = litersToMl(tank.on_hand_liters);
    const reservedMl = litersToMl(tank.reserved_liters);
    const capacityMl = litersToMl(tank.capacity_liters);
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
    const availableMl = litersToMl(from.on_hand_liters) - litersToMl(from.reserved_liters);
    if (qMl > availableMl && qMl - availableMl <= roundingCrumbMl(units) && availableMl > 0) qMl = availableMl;
    if (qMl > availableMl) {
      throw new HttpError(409, `${from.name} has only ${formatMl(availableMl, units, { floor: true })} available to move (reserved fuel stays put).`, { quantity: ['More than is available.'] }, {
        availableLiters: availableMl / 1000, available: mlToUnitsFloor(availableMl, units),
      });
    }
    const roomMl = litersToMl(to.capacity_liters) - litersToMl(to.on_hand_liters);
    if (qMl > roomMl) {
      throw new HttpError(409, `${to.name} has room for only ${formatMl(roomMl, units, { floor: true })}.`, { quantity: ['More than the destination can hold.'] });
    }
    const out = await recordMovement(transaction, { coopId: actor.coop.id, tankId: from.id, kind: 'transfer-out', quantityMl: -qMl, transferTankId: to.id, reason: input.reason ?? null, userId: actor.user.id });
    const inn = await recordMovement(transaction, { coopId: actor.coop.id, tankId: to.id, kind: 'transfer-in', quantityMl: qMl, valueCents: -out.valueCents, transferTankId: from.id, reason: input.reason ?? null, userId: actor.user.id });
    await audit({
      coopId: actor.coop.id, actorUserId: actor.user.id, action: 'tank.transfer', entityType: 'tank', entityId: from.id,
      before: { fromOnHandLiters: from.on_hand_liters, toOnHandLiters: to.on_hand_liters },
      after: { toTankId: to.id, quantityLiters: mlToLiters(qMl), valueCents: -out.valueCents, movementIds: [out.id, inn.id] },
    }, transaction);
  });
  return { from: await getTank(actor, input.fromTankId), to: await getTank(actor, input.toTankId) };
}

export interface MovementDto {
  id: string;
  kind: MovementKind;
  quantityLiters: number;
  /** Signed, in the co-op's unit. */
  quantity: number;
  valueCents: number;
  onHandAfterLiters: number;
  onHandAfter: number;
  valueAfterCents: number;
  reason: string | null;
  batchId: number | null;
  drawId: number | null;
  memberName: string | null;
  transferTankName: string | null;
  byName: string | null;
  occurredAt: string;
}

const MOVEMENT_SORT = { recorded: 'm.id', occurred_at: 'm.occurred_at', quantity: 'm.quantity_liters', kind: 'm.kind' } as const;

/**
 * A tank's ledger, a page at a time, sorted on the server (default: newest first as recorded).
 * @param actor brewer, treasurer or admin (draws:read-all)
 */
export async function listMovements(actor: Actor, tankId: number, q: z.infer<typeof movementListSchema>) {
  const units = actor.coop.units;
  const [tank] = await sequelize.query<{ id: number }>(`SELECT id FROM tanks WHERE id = :tankId AND coop_id = :coopId`, {
    replacements: { tankId, coopId: actor.coop.id }, type: QueryTypes.SELECT,
  });
  if (!tank) throw notFound('Tank not found.');
  const where = `m.coop_id = :coopId AND m.tank_id = :tankId ${q.kind ? 'AND m.kind = :kind' : ''}`;
  const replacements = { coopId: actor.coop.id, tankId, kind: q.kind ?? null, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  const order = `${MOVEMENT_SORT[q.sort as keyof typeof MOVEMENT_SORT]} ${q.dir === 'asc' ? 'ASC' : 'DESC'}, m.id ${q.dir === 'asc' ? 'ASC' : 'DESC'}`;
  const [rows, [count]] = await Promise.all([
    sequelize.query<{
      id: string; kind: MovementKind; quantity_liters: string; value_cents: string; on_hand_after_liters: string; value_after_cents: string;
      reason: string | null; batch_id: number | null; draw_id: number | null; member_name: string | null; transfer_tank_name: string | null; by_name: string | null; occurred_at: Date;
    }>(
      `SELECT m.id, m.kind, m.quantity_liters, m.value_cents, m.on_hand_after_liters, m.value_after_cents, m.reason, m.batch_id, m.draw_id,
              du.name AS member_name, tt.name AS transfer_tank_name, u.name AS by_name, m.occurred_at
       FROM tank_movements m
       LEFT JOIN users u ON u.id = m.created_by_user_id
       LEFT JOIN tanks tt ON tt.id = m.transfer_tank_id AND tt.coop_id = m.coop_id
       LEFT JOIN draws d ON d.id = m.draw_id AND d.coop_id = m.coop_id
       LEFT JOIN memberships dm ON dm.id = d.membership_id
       LEFT JOIN users du ON du.id = dm.user_id
       WHERE ${where} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: string }>(`SELECT count(*)::text AS n FROM tank_movements m WHERE ${where}`, { replacements, type: QueryTypes.SELECT }),
  ]);
  const items: MovementDto[] = rows.map((r) => {
    const qMl = litersToMl(r.quantity_liters);
    const afterMl = litersToMl(r.on_hand_after_liters);
    return {
      id: r.id, kind: r.kind, quantityLiters: qMl / 1000, quantity: mlToUnits3(qMl, units), valueCents: Number(r.value_cents),
      onHandAfterLiters: afterMl / 1000, onHandAfter: mlToUnits3(afterMl, units), valueAfterCents: Number(r.value_after_cents),
      reason: r.reason, batchId: r.batch_id, drawId: r.draw_id, memberName: r.member_name, transferTankName: r.transfer_tank_name, byName: r.by_name,
      occurredAt: new Date(r.occurred_at).toISOString(),
    };
  });
  return { items, page: q.page, pageSize: q.pageSize, total: Number(count?.n ?? 0) };
}
