import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import { can, type Actor } from '@/lib/auth';
import { sequelize } from '@/lib/db';
import { conflict, forbidden, HttpError, notFound } from '@/lib/http';
import type { DeclaredUse } from '@/lib/pricing';
import { policyInForce } from '@/lib/pricing-policy';
import { priceDraw } from '@/lib/pricing-policy/convert';
import { expireLapsedReservations } from '@/lib/reservations/expire';
import { parseInstant, parseWindowEdge } from '@/lib/reservations/window';
import { lockTank } from '@/lib/tank';
import { recordMovement } from '@/lib/tank/ledger';
import { litersToMl, mlToLiters } from '@/lib/tank/quantity';
import { inTransaction, sqlState } from '@/lib/tank/tx';
import { formatMl, milliUnitsToMl, mlToUnits3, mlToUnitsFloor, roundingCrumbMl } from '@/lib/tank/volume';
import { drawQuantityMilli, type drawCreateSchema, type drawListSchema, type drawReverseSchema } from '@/lib/validation/tank';

export type DrawStatus = 'recorded' | 'reversed' | 'reversal';

export interface DrawDto {
  id: number;
  tankId: number;
  tankName: string;
  membershipId: number;
  memberName: string;
  reservationId: number | null;
  quantityLiters: number;
  /** In the co-op's unit; negative on a reversal. */
  quantity: number;
  meterBefore: number | null;
  meterAfter: number | null;
  declaredUse: DeclaredUse;
  vehicle: string | null;
  unitPriceCentsPerGallon: number;
  surchargeCentsPerGallon: number;
  roadTaxCentsPerGallon: number;
  fuelCents: number;
  surchargeCents: number;
  taxCents: number;
  totalCents: number;
  costValueCents: number;
  reversesDrawId: number | null;
  reversedByDrawId: number | null;
  reason: string | null;
  recordedBy: string | null;
  occurredAt: string;
  status: DrawStatus;
}

/**
 * Who may record draws: brewers and admins for anyone ('any'); a member for themself only when
 * the co-op runs a self-serve pump ('self'); otherwise 403. Call it before reading the body.
 */
export function drawRecorderScope(actor: Actor): 'any' | 'self' {
  if (can(actor.role, 'draws:record')) return 'any';
  if (actor.coop.settings?.selfServeDraws === true) return 'self';
  throw forbidden('Draws are recorded by the co-op’s brewers (this co-op has no self-serve pump).');
}

const bad = (fields: Record<string, string[]>) => new HttpError(422, 'Some fields need attention.', fields);

/**
 * Records a draw, all in one transaction: expire lapsed reservations; check the member (and
 * the reservation: same member, same tank, still open — it is closed and its quantity released
 * before the outflow, so drawing less than reserved is fine and more needs the extra to be
 * available); lock the price in force onto the row (lib/pricing + lib/money rounding, per line);
 * write the 'draw' ledger row through recordMovement (value out at moving-average cost).
 */
export async function recordDraw(actor: Actor, input: z.infer<typeof drawCreateSchema>): Promise<DrawDto> {
  const scope = drawRecorderScope(actor);
  const units = actor.coop.units;
  let membershipId = input.membershipId;
  if (scope === 'self') {
    if (membershipId !== undefined && membershipId !== actor.membershipId) throw bad({ membershipId: ['At a self-serve pump you record only your own draws.'] });
    if (input.occurredAt !== undefined) throw bad({ occurredAt: ['Self-serve draws are recorded as they happen.'] });
    membershipId = actor.membershipId;
  }
  if (membershipId === undefined) throw bad({ membershipId: ['Choose the member who drew the fuel.'] });
  let occurredAt = new Date();
  if (input.occurredAt) {
    const t = parseInstant(input.occurredAt, actor.coop.timezone);
    if (!t) throw bad({ occurredAt: ['Enter a date and time.'] });
    if (t.getTime() > Date.now() + 5 * 60_000) throw bad({ occurredAt: ['A draw cannot be recorded in the future.'] });
    if (t.getTime() < Date.now() - 31 * 86_400_000) throw bad({ occurredAt: ['Draws older than 31 days cannot be entered; ask the treasurer for an adjustment.'] });
    occurredAt = t;
  }
  const qMilli = drawQuantityMilli(input);
  const meterBeforeMl = input.meterBefore !== undefined ? milliUnitsToMl(input.meterBefore, units) : null;
  const meterAfterMl = input.meterAfter !== undefined ? milliUnitsToMl(input.meterAfter, units) : null;
  let qMl = meterBeforeMl !== null && meterAfterMl !== null ? meterAfterMl - meterBeforeMl : milliUnitsToMl(qMilli, units);
  if (qMl <= 0) throw bad({ quantity: ['Enter a quantity greater than zero.'] });

  const id = await inTransaction(async (t) => {
    await expireLapsedReservations(actor.coop.id, t);
    const [member] = await sequelize.query<{ id: number; status: string }>(
      `SELECT id, status FROM memberships WHERE id = :id AND coop_id = :coopId`,
      { replacements: { id: membershipId, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!member) throw bad({ membershipId: ['No such member in this co-op.'] });
    if (member.status !== 'active') throw bad({ membershipId: ['This member is suspended.'] });

    let reservation: { id: number; quantity_liters: string } | null = null;
    if (input.reservationId !== undefined) {
      const [r] = await sequelize.query<{ id: number; tank_id: number; membership_id: number; quantity_liters: string; status: string }>(
        `SELECT id, tank_id, membership_id, quantity_liters, status FROM reservations WHERE id = :id AND coop_id = :coopId FOR UPDATE`,
        { replacements: { id: input.reservationId, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction: t },
      );
      if (!r || (scope === 'self' && r.membership_id !== actor.membershipId)) throw bad({ reservationId: ['No such reservation in this co-op.'] });
      if (r.membership_id !== membershipId) throw bad({ reservationId: ['This reservation belongs to another member.'] });
      if (r.tank_id !== input.tankId) throw bad({ reservationId: ['This reservation is for another tank.'] });
      if (r.status !== 'open') {
        throw conflict(
          r.status === 'expired' ? 'This reservation has expired (its window ended). Record the draw as a walk-up instead.' : `This reservation is already ${r.status}.`,
          { status: r.status },
        );
      }
      reservation = r;
    }

    const tank = await lockTank(actor.coop.id, input.tankId, t).catch((e) => {
      if (e instanceof HttpError && e.status === 404) throw bad({ tankId: ['No such tank in this co-op.'] });
      throw e;
    });
    if (!tank.active) throw conflict(`${tank.name} is out of service.`);
    const onHandMl = litersToMl(tank.on_hand_liters);
    let reservedMl = litersToMl(tank.reserved_liters);
    if (reservation) {
      reservedMl -= litersToMl(reservation.quantity_liters);
      await sequelize.query(`UPDATE tanks SET reserved_liters = reserved_liters - :q, updated_at = now() WHERE id = :tankId AND coop_id = :coopId`, {
        replacements: { q: reservation.quantity_liters, tankId: tank.id, coopId: actor.coop.id }, transaction: t,
      });
      await sequelize.query(`UPDATE reservations SET status = 'drawn', closed_at = now(), updated_at = now() WHERE id = :id AND coop_id = :coopId`, {
        replacements: { id: reservation.id, coopId: actor.coop.id }, transaction: t,
      });
    }
    const availableMl = onHandMl - reservedMl;
    // The meter is the truth; a book short by a rounding crumb gives up its last millilitres.
    if (qMl > availableMl && qMl - availableMl <= roundingCrumbMl(units) && availableMl > 0) qMl = availableMl;
    if (qMl > availableMl) {
      const what = reservation ? 'beyond the reservation' : 'for a walk-up draw';
      throw new HttpError(
        409,
        `${tank.name} can cover only ${formatMl(availableMl, units, { floor: true, digits: 3 })} ${what} (the rest is reserved by other members or not in the tank).`,
        { quantity: ['More than is available.'] },
        { availableLiters: Math.max(0, availableMl) / 1000, available: mlToUnitsFloor(Math.max(0, availableMl), units) },
      );
    }

    const policy = await policyInForce(actor.coop.id, t);
    if (!policy) throw conflict('No member price is set yet. The treasurer sets the pricing policy before draws can be recorded.');
    const pricing = priceDraw(policy, units, { onHandMl, valueCents: Number(tank.value_cents) }, qMilli, input.declaredUse);

    const drawId = await nextDrawId(t);
    const moved = await recordMovement(t, { coopId: actor.coop.id, tankId: tank.id, kind: 'draw', quantityMl: -qMl, drawId, userId: actor.user.id, occurredAt });
    await sequelize.query(
      `INSERT INTO draws (id, coop_id, tank_id, membership_id, reservation_id, quantity_liters, meter_before, meter_after, declared_use, vehicle,
         price_policy_id, unit_price_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon,
         fuel_cents, surcharge_cents, tax_cents, total_cents, cost_value_cents, recorded_by_user_id, occurred_at)
       VALUES (:id, :coopId, :tankId, :membershipId, :reservationId, :q, :mb, :ma, :use, :vehicle, :policyId, :unit, :sur, :tax,
         :fuelCents, :surchargeCents, :taxCents, :totalCents, :cost, :userId, :occurredAt)`,
      {
        replacements: {
          id: drawId, coopId: actor.coop.id, tankId: tank.id, membershipId, reservationId: reservation?.id ?? null, q: mlToLiters(qMl),
          mb: meterBeforeMl === null ? null : mlToLiters(meterBeforeMl), ma: meterAfterMl === null ? null : mlToLiters(meterAfterMl),
          use: input.declaredUse, vehicle: input.vehicle || null, policyId: policy.id,
          unit: pricing.locked.unitPriceCentsPerGallon, sur: pricing.locked.surchargeCentsPerGallon, tax: pricing.locked.roadTaxCentsPerGallon,
          fuelCents: pricing.charge.fuelCents, surchargeCents: pricing.charge.surchargeCents, taxCents: pricing.charge.taxCents, totalCents: pricing.charge.totalCents,
          cost: -moved.valueCents, userId: actor.user.id, occurredAt,
        },
        transaction: t,
      },
    );
    await audit({
      coopId: actor.coop.id, actorUserId: actor.user.id, action: 'draw.record', entityType: 'draw', entityId: drawId,
      before: reservation ? { reservationId: reservation.id, reservationStatus: 'open' } : null,
      after: { tankId: tank.id, membershipId, quantityLiters: mlToLiters(qMl), declaredUse: input.declaredUse, pricePolicyId: policy.id, perUnit: pricing.perUnit, charge: pricing.charge, costValueCents: -moved.valueCents, movementId: moved.id },
    }, t);
    return drawId;
  });
  return getDraw(actor, id);
}

async function nextDrawId(t: Transaction): Promise<number> {
  const [row] = await sequelize.query<{ id: string }>(`SELECT nextval(pg_get_serial_sequence('draws', 'id'))::text AS id`, { type: QueryTypes.SELECT, transaction: t });
  return Number(row!.id);
}

/**
 * Corrects a draw the only way allowed: a reversing entry. A new draws row with negative
 * quantity and amounts (same locked rates), the reason, and a 'draw-reversal' ledger row that
 * puts the fuel and the exact value it took back into the tank. A draw is reversed at most once
 * (UNIQUE reverses_draw_id); a reversal cannot itself be reversed — record a new draw instead.
 */
export async function reverseDraw(actor: Actor, drawId: number, input: z.infer<typeof drawReverseSchema>): Promise<DrawDto> {
  let reversalId: number;
  try {
    reversalId = await inTransaction(async (t) => {
      const [d] = await sequelize.query<{
        id: number; tank_id: number; membership_id: number; quantity_liters: string; declared_use: string; vehicle: string | null; price_policy_id: number | null;
        unit_price_cents_per_gallon: string; surcharge_cents_per_gallon: string; road_tax_cents_per_gallon: string;
        fuel_cents: string; surcharge_cents: string; tax_cents: string; total_cents: string; cost_value_cents: string; reverses_draw_id: number | null; reversed_by: number | null;
      }>(
        `SELECT d.*, (SELECT r.id FROM draws r WHERE r.reverses_draw_id = d.id) AS reversed_by FROM draws d WHERE d.id = :id AND d.coop_id = :coopId FOR UPDATE`,
        { replacements: { id: drawId, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction: t },
      );
      if (!d) throw notFound('Draw not found.');
      if (d.reverses_draw_id !== null) throw conflict('This entry is itself a reversal and cannot be reversed; record a new draw instead.');
      if (d.reversed_by !== null) throw conflict(`This draw was already reversed (entry #${d.reversed_by}).`, { reversedByDrawId: d.reversed_by });
      const tank = await lockTank(actor.coop.id, d.tank_id, t);
      if (!tank.active) throw conflict(`${tank.name} is out of service; put it back in service to return fuel to it.`);
      const qMl = litersToMl(d.quantity_liters);
      const id = await nextDrawId(t);
      const moved = await recordMovement(t, {
        coopId: actor.coop.id, tankId: d.tank_id, kind: 'draw-reversal', quantityMl: qMl, valueCents: Number(d.cost_value_cents), drawId: id, reason: input.reason, userId: actor.user.id,
      });
      const neg = (v: string) => String(-Number(v));
      await sequelize.query(
        `INSERT INTO draws (id, coop_id, tank_id, membership_id, quantity_liters, declared_use, vehicle, price_policy_id,
           unit_price_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon, fuel_cents, surcharge_cents, tax_cents, total_cents,
           cost_value_cents, reverses_draw_id, reason, recorded_by_user_id)
         VALUES (:id, :coopId, :tankId, :membershipId, :q, :use, :vehicle, :policyId, :unit, :sur, :tax, :fuel, :surCents, :taxCents, :total, :cost, :reverses, :reason, :userId)`,
        {
          replacements: {
            id, coopId: actor.coop.id, tankId: d.tank_id, membershipId: d.membership_id, q: mlToLiters(-qMl), use: d.declared_use, vehicle: d.vehicle, policyId: d.price_policy_id,
            unit: d.unit_price_cents_per_gallon, sur: d.surcharge_cents_per_gallon, tax: d.road_tax_cents_per_gallon,
            fuel: neg(d.fuel_cents), surCents: neg(d.surcharge_cents), taxCents: neg(d.tax_cents), total: neg(d.total_cents), cost: neg(d.cost_value_cents),
            reverses: d.id, reason: input.reason, userId: actor.user.id,
          },
          transaction: t,
        },
      );
      await audit({
        coopId: actor.coop.id, actorUserId: actor.user.id, action: 'draw.reverse', entityType: 'draw', entityId: d.id,
        before: { drawId: d.id, reversed: false }, after: { reversalDrawId: id, reason: input.reason, quantityLiters: mlToLiters(-qMl), totalCents: -Number(d.total_cents), movementId: moved.id },
      }, t);
      return id;
    });
  } catch (e) {
    if (sqlState(e) === '23505') throw conflict('This draw was already reversed.');
    throw e;
  }
  return getDraw(actor, reversalId);
}

interface DrawRow {
  id: number; tank_id: number; tank_name: string; membership_id: number; member_name: string; reservation_id: number | null; quantity_liters: string;
  meter_before: string | null; meter_after: string | null; declared_use: DeclaredUse; vehicle: string | null;
  unit_price_cents_per_gallon: string; surcharge_cents_per_gallon: string; road_tax_cents_per_gallon: string;
  fuel_cents: string; surcharge_cents: string; tax_cents: string; total_cents: string; cost_value_cents: string;
  reverses_draw_id: number | null; reversed_by: number | null; reason: string | null; recorded_by: string | null; occurred_at: Date;
}

const DRAW_SELECT = `SELECT d.id, d.tank_id, t.name AS tank_name, d.membership_id, u.name AS member_name, d.reservation_id, d.quantity_liters,
    d.meter_before, d.meter_after, d.declared_use, d.vehicle, d.unit_price_cents_per_gallon, d.surcharge_cents_per_gallon, d.road_tax_cents_per_gallon,
    d.fuel_cents, d.surcharge_cents, d.tax_cents, d.total_cents, d.cost_value_cents, d.reverses_draw_id, rv.id AS reversed_by, d.reason,
    rb.name AS recorded_by, d.occurred_at
  FROM draws d
  JOIN tanks t ON t.id = d.tank_id AND t.coop_id = d.coop_id
  JOIN memberships m ON m.id = d.membership_id
  JOIN users u ON u.id = m.user_id
  LEFT JOIN draws rv ON rv.reverses_draw_id = d.id
  LEFT JOIN users rb ON rb.id = d.recorded_by_user_id`;

function drawDto(r: DrawRow, actor: Actor): DrawDto {
  const units = actor.coop.units;
  const qMl = litersToMl(r.quantity_liters);
  const meter = (v: string | null) => (v === null ? null : mlToUnits3(litersToMl(v), units));
  return {
    id: r.id, tankId: r.tank_id, tankName: r.tank_name, membershipId: r.membership_id, memberName: r.member_name, reservationId: r.reservation_id,
    quantityLiters: qMl / 1000, quantity: mlToUnits3(qMl, units), meterBefore: meter(r.meter_before), meterAfter: meter(r.meter_after),
    declaredUse: r.declared_use, vehicle: r.vehicle,
    unitPriceCentsPerGallon: Number(r.unit_price_cents_per_gallon), surchargeCentsPerGallon: Number(r.surcharge_cents_per_gallon), roadTaxCentsPerGallon: Number(r.road_tax_cents_per_gallon),
    fuelCents: Number(r.fuel_cents), surchargeCents: Number(r.surcharge_cents), taxCents: Number(r.tax_cents), totalCents: Number(r.total_cents), costValueCents: Number(r.cost_value_cents),
    reversesDrawId: r.reverses_draw_id, reversedByDrawId: r.reversed_by, reason: r.reason, recordedBy: r.recorded_by,
    occurredAt: new Date(r.occurred_at).toISOString(),
    status: r.reverses_draw_id !== null ? 'reversal' : r.reversed_by !== null ? 'reversed' : 'recorded',
  };
}

/** One draw: a member sees their own, brewers/treasurers/admins any of the co-op's; else 404. */
export async function getDraw(actor: Actor, id: number): Promise<DrawDto> {
  const [row] = await sequelize.query<DrawRow>(`${DRAW_SELECT} WHERE d.id = :id AND d.coop_id = :coopId`, { replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT });
  if (!row || (row.membership_id !== actor.membershipId && !can(actor.role, 'draws:read-all'))) throw notFound('Draw not found.');
  return drawDto(row, actor);
}

const DRAW_SORT = { occurred_at: 'd.occurred_at', quantity: 'd.quantity_liters', total: 'd.total_cents' } as const;

/**
 * Draws of the co-op, a page at a time, with totals for the filter. Members see their own;
 * draws:read-all roles see all and may filter by member, tank, status and date (co-op's days).
 */
export async function listDraws(actor: Actor, q: z.infer<typeof drawListSchema>, opts: { own?: boolean } = {}) {
  const own = opts.own || !can(actor.role, 'draws:read-all');
  const tz = actor.coop.timezone;
  const conds = ['d.coop_id = :coopId'];
  const rep: Record<string, unknown> = { coopId: actor.coop.id, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  if (own) { conds.push('d.membership_id = :me'); rep.me = actor.membershipId; }
  else if (q.membershipId) { conds.push('d.membership_id = :membershipId'); rep.membershipId = q.membershipId; }
  if (q.tankId) { conds.push('d.tank_id = :tankId'); rep.tankId = q.tankId; }
  if (q.status === 'reversal') conds.push('d.reverses_draw_id IS NOT NULL');
  if (q.status === 'reversed') conds.push('d.reverses_draw_id IS NULL AND EXISTS (SELECT 1 FROM draws x WHERE x.reverses_draw_id = d.id)');
  if (q.status === 'recorded') conds.push('d.reverses_draw_id IS NULL AND NOT EXISTS (SELECT 1 FROM draws x WHERE x.reverses_draw_id = d.id)');
  if (q.from) { conds.push('d.occurred_at >= :from'); rep.from = parseWindowEdge(q.from, tz, false); }
  if (q.to) { conds.push('d.occurred_at < :to'); rep.to = parseWindowEdge(q.to, tz, true); }
  const where = conds.join(' AND ');
  const order = `${DRAW_SORT[q.sort as keyof typeof DRAW_SORT]} ${q.dir === 'asc' ? 'ASC' : 'DESC'}, d.id DESC`;
  const [rows, [agg]] = await Promise.all([
    sequelize.query<DrawRow>(`${DRAW_SELECT} WHERE ${where} ORDER BY ${order} LIMIT :limit OFFSET :offset`, { replacements: rep, type: QueryTypes.SELECT }),
    sequelize.query<{ n: string; liters: string | null; total: string | null }>(
      `SELECT count(*)::text AS n, coalesce(sum(d.quantity_liters), 0)::text AS liters, coalesce(sum(d.total_cents), 0)::text AS total FROM draws d WHERE ${where}`,
      { replacements: rep, type: QueryTypes.SELECT },
    ),
  ]);
  const netMl = litersToMl(agg?.liters ?? '0');
  return {
    items: rows.map((r) => drawDto(r, actor)), page: q.page, pageSize: q.pageSize, total: Number(agg?.n ?? 0),
    totals: { quantityLiters: netMl / 1000, quantity: mlToUnits3(netMl, actor.coop.units), totalCents: Number(agg?.total ?? 0) },
  };
}

/** Active members of the co-op for the draw form and the filters (draws:read-all roles). */
export async function listDrawMembers(actor: Actor): Promise<{ membershipId: number; name: string }[]> {
  if (!can(actor.role, 'draws:read-all')) return [{ membershipId: actor.membershipId, name: actor.user.name }];
  return sequelize.query<{ membershipId: number; name: string }>(
    `SELECT m.id AS "membershipId", u.name FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.coop_id = :coopId AND m.status = 'active' ORDER BY u.name, m.id`,
    { replacements: { coopId: actor.coop.id }, type: QueryTypes.SELECT },
  );
}
