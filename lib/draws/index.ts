import 'server-only';
import type { drawSchema } from '@/lib/api/dto/tank';
import { col, fn, Op, type InferAttributes, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import { can, type Actor } from '@/lib/auth';
import { inTransaction, sqlState } from '@/lib/db';
import { conflict, forbidden, HttpError, notFound } from '@/lib/http';
import { policyInForce } from '@/lib/pricing-policy';
import { priceDraw } from '@/lib/pricing-policy/convert';
import { expireLapsedReservations } from '@/lib/reservations/expire';
import { parseInstant, parseWindowEdge } from '@/lib/reservations/window';
import { lockTank } from '@/lib/tank';
import { recordMovement } from '@/lib/tank/ledger';
import { drawShares, type LineageSource } from '@/lib/tank/lineage';
import { drawBatches } from '@/lib/lineage/read';
import { litersToMl, mlToLiters } from '@/lib/tank/quantity';
import { formatMl, milliUnitsToMl, mlToUnits3, mlToUnitsFloor, roundingCrumbMl } from '@/lib/tank/volume';
import { drawQuantityMilli, type drawCreateSchema, type drawListSchema, type drawReverseSchema } from '@/lib/validation/tank';
import { Draw, Membership, Reservation, Tank, User } from '@/models';
import { nextDrawId } from './queries';

export type DrawStatus = 'recorded' | 'reversed' | 'reversal';

export type DrawDto = z.infer<typeof drawSchema>;

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
    const member = await Membership.findOne({ attributes: ['id', 'status'], where: { id: membershipId, coopId: actor.coop.id }, transaction: t, raw: true });
    if (!member) throw bad({ membershipId: ['No such member in this co-op.'] });
    if (member.status !== 'active') throw bad({ membershipId: ['This member is suspended.'] });

    let reservation: Pick<InferAttributes<Reservation>, 'id' | 'quantityLiters'> | null = null;
    if (input.reservationId !== undefined) {
      const r = await Reservation.findOne({
        attributes: ['id', 'tankId', 'membershipId', 'quantityLiters', 'status'], where: { id: input.reservationId, coopId: actor.coop.id }, lock: t.LOCK.UPDATE, transaction: t, raw: true,
      });
      if (!r || (scope === 'self' && r.membershipId !== actor.membershipId)) throw bad({ reservationId: ['No such reservation in this co-op.'] });
      if (r.membershipId !== membershipId) throw bad({ reservationId: ['This reservation belongs to another member.'] });
      if (r.tankId !== input.tankId) throw bad({ reservationId: ['This reservation is for another tank.'] });
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
    const onHandMl = litersToMl(tank.onHandLiters);
    let reservedMl = litersToMl(tank.reservedLiters);
    if (reservation) {
      const reservedByItMl = litersToMl(reservation.quantityLiters);
      reservedMl -= reservedByItMl;
      await Tank.decrement({ reservedLiters: reservedByItMl / 1000 }, { where: { id: tank.id, coopId: actor.coop.id }, transaction: t });
      await Reservation.update({ status: 'drawn', closedAt: new Date() }, { where: { id: reservation.id, coopId: actor.coop.id }, transaction: t });
    }
    // Fuel held while a batch in the tank is under review cannot be drawn.
    const availableMl = onHandMl - reservedMl - litersToMl(tank.heldLiters);
    // The meter is the truth; a book short by a rounding crumb gives up its last millilitres.
    if (qMl > availableMl && qMl - availableMl <= roundingCrumbMl(units) && availableMl > 0) qMl = availableMl;
    if (qMl > availableMl) {
      const what = reservation ? 'beyond the reservation' : 'for a walk-up draw';
      throw new HttpError(
        409,
        `${tank.name} can cover only ${formatMl(availableMl, units, { floor: true, digits: 3 })} ${what} (the rest is reserved by other members${Number(tank.heldLiters) > 0 ? ', held while a batch is under review' : ''} or not in the tank).`,
        { quantity: ['More than is available.'] },
        { availableLiters: Math.max(0, availableMl) / 1000, available: mlToUnitsFloor(Math.max(0, availableMl), units) },
      );
    }

    const policy = await policyInForce(actor.coop.id, t);
    if (!policy) throw conflict('No member price is set yet. The treasurer sets the pricing policy before draws can be recorded.');
    const pricing = priceDraw(policy, units, { onHandMl, valueCents: Number(tank.valueCents) }, qMilli, input.declaredUse);

    const drawId = await nextDrawId(t);
    const moved = await recordMovement(t, { coopId: actor.coop.id, tankId: tank.id, kind: 'draw', quantityMl: -qMl, drawId, userId: actor.user.id, occurredAt });
    await Draw.create(
      {
        id: drawId, coopId: actor.coop.id, tankId: tank.id, membershipId, reservationId: reservation?.id ?? null, quantityLiters: mlToLiters(qMl),
        meterBefore: meterBeforeMl === null ? null : mlToLiters(meterBeforeMl), meterAfter: meterAfterMl === null ? null : mlToLiters(meterAfterMl),
        declaredUse: input.declaredUse, vehicle: input.vehicle || null, pricePolicyId: policy.id,
        unitPriceCentsPerGallon: String(pricing.locked.unitPriceCentsPerGallon), surchargeCentsPerGallon: String(pricing.locked.surchargeCentsPerGallon),
        roadTaxCentsPerGallon: String(pricing.locked.roadTaxCentsPerGallon),
        fuelCents: String(pricing.charge.fuelCents), surchargeCents: String(pricing.charge.surchargeCents), taxCents: String(pricing.charge.taxCents),
        totalCents: String(pricing.charge.totalCents), costValueCents: String(-moved.valueCents), recordedByUserId: actor.user.id, reason: null, reversesDrawId: null, occurredAt,
      },
      { transaction: t },
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
      const d = await Draw.findOne({ where: { id: drawId, coopId: actor.coop.id }, lock: t.LOCK.UPDATE, transaction: t, raw: true });
      if (!d) throw notFound('Draw not found.');
      if (d.reversesDrawId !== null) throw conflict('This entry is itself a reversal and cannot be reversed; record a new draw instead.');
      const reversal = await Draw.findOne({ attributes: ['id'], where: { reversesDrawId: d.id, coopId: actor.coop.id }, transaction: t, raw: true });
      if (reversal) throw conflict(`This draw was already reversed (entry #${reversal.id}).`, { reversedByDrawId: reversal.id });
      const tank = await lockTank(actor.coop.id, d.tankId, t);
      if (!tank.active) throw conflict(`${tank.name} is out of service; put it back in service to return fuel to it.`);
      const qMl = litersToMl(d.quantityLiters);
      const id = await nextDrawId(t);
      const moved = await recordMovement(t, {
        coopId: actor.coop.id, tankId: d.tankId, kind: 'draw-reversal', quantityMl: qMl, valueCents: Number(d.costValueCents), drawId: id, reason: input.reason, userId: actor.user.id,
        lineage: await reversalSource(t, actor.coop.id, d.id),
      });
      const neg = (v: string) => String(-Number(v));
      await Draw.create(
        {
          id, coopId: actor.coop.id, tankId: d.tankId, membershipId: d.membershipId, reservationId: null, quantityLiters: mlToLiters(-qMl),
          meterBefore: null, meterAfter: null, declaredUse: d.declaredUse, vehicle: d.vehicle, pricePolicyId: d.pricePolicyId,
          unitPriceCentsPerGallon: d.unitPriceCentsPerGallon, surchargeCentsPerGallon: d.surchargeCentsPerGallon, roadTaxCentsPerGallon: d.roadTaxCentsPerGallon,
          fuelCents: neg(d.fuelCents), surchargeCents: neg(d.surchargeCents), taxCents: neg(d.taxCents), totalCents: neg(d.totalCents), costValueCents: neg(d.costValueCents),
          reversesDrawId: d.id, reason: input.reason, recordedByUserId: actor.user.id,
        },
        { transaction: t },
      );
      await audit({
        coopId: actor.coop.id, actorUserId: actor.user.id, action: 'draw.reverse', entityType: 'draw', entityId: d.id,
        before: { drawId: d.id, reversed: false }, after: { reversalDrawId: id, reason: input.reason, quantityLiters: mlToLiters(-qMl), totalCents: -Number(d.totalCents), movementId: moved.id },
      }, t);
      return id;
    });
  } catch (e) {
    if (sqlState(e) === '23505') throw conflict('This draw was already reversed.');
    throw e;
  }
  return getDraw(actor, reversalId);
}

/** A reversal returns the draw's batches; a draw recorded before lineage existed returns unattributed fuel. */
async function reversalSource(t: Transaction, coopId: number, drawId: number): Promise<LineageSource> {
  const shares = await drawShares(t, coopId, drawId);
  return shares.length ? { kind: 'shares', shares } : { kind: 'origin', batchId: null };
}

/** A draw as the lists read it (raw, nested includes). */
type DrawListRow = Pick<InferAttributes<Draw>,
  'id' | 'tankId' | 'membershipId' | 'reservationId' | 'quantityLiters' | 'meterBefore' | 'meterAfter' | 'declaredUse' | 'vehicle'
  | 'unitPriceCentsPerGallon' | 'surchargeCentsPerGallon' | 'roadTaxCentsPerGallon' | 'fuelCents' | 'surchargeCents' | 'taxCents' | 'totalCents'
  | 'costValueCents' | 'reversesDrawId' | 'reason' | 'occurredAt'> & {
  tank: { name: string };
  membership: { user: { name: string } };
  reversal: { id: number | null };
  recordedBy: { name: string | null };
};

const DRAW_ATTRIBUTES = [
  'id', 'tankId', 'membershipId', 'reservationId', 'quantityLiters', 'meterBefore', 'meterAfter', 'declaredUse', 'vehicle',
  'unitPriceCentsPerGallon', 'surchargeCentsPerGallon', 'roadTaxCentsPerGallon', 'fuelCents', 'surchargeCents', 'taxCents', 'totalCents',
  'costValueCents', 'reversesDrawId', 'reason', 'occurredAt',
] as const;

/**
 * Tank name, member name, the entry that reversed it (at most one: UNIQUE reverses_draw_id) and
 * who recorded it, joined in the same query. `attributes: false` leaves a join's columns out
 * (for the totals, which only filter through it).
 */
const drawInclude = (coopId: number, withColumns = true) => [
  { model: Tank, as: 'tank', attributes: withColumns ? ['name'] : [], where: { coopId }, required: true },
  { model: Membership, as: 'membership', attributes: [], required: true, include: [{ model: User, as: 'user', attributes: withColumns ? ['name'] : [], required: true }] },
  { model: Draw, as: 'reversal', attributes: withColumns ? ['id'] : [], required: false },
  ...(withColumns ? [{ model: User, as: 'recordedBy', attributes: ['name'], required: false }] : []),
];

function drawDto(r: DrawListRow, actor: Actor): DrawDto {
  const units = actor.coop.units;
  const qMl = litersToMl(r.quantityLiters);
  const meter = (v: string | null) => (v === null ? null : mlToUnits3(litersToMl(v), units));
  const reversedBy = r.reversal?.id ?? null;
  return {
    id: r.id, tankId: r.tankId, tankName: r.tank.name, membershipId: r.membershipId, memberName: r.membership.user.name, reservationId: r.reservationId,
    quantityLiters: qMl / 1000, quantity: mlToUnits3(qMl, units), meterBefore: meter(r.meterBefore), meterAfter: meter(r.meterAfter),
    declaredUse: r.declaredUse, vehicle: r.vehicle,
    unitPriceCentsPerGallon: Number(r.unitPriceCentsPerGallon), surchargeCentsPerGallon: Number(r.surchargeCentsPerGallon), roadTaxCentsPerGallon: Number(r.roadTaxCentsPerGallon),
    fuelCents: Number(r.fuelCents), surchargeCents: Number(r.surchargeCents), taxCents: Number(r.taxCents), totalCents: Number(r.totalCents), costValueCents: Number(r.costValueCents),
    reversesDrawId: r.reversesDrawId, reversedByDrawId: reversedBy, reason: r.reason, recordedBy: r.recordedBy?.name ?? null,
    occurredAt: new Date(r.occurredAt).toISOString(),
    status: r.reversesDrawId !== null ? 'reversal' : reversedBy !== null ? 'reversed' : 'recorded',
    batches: [],
  };
}

/** Adds each draw's batches (one indexed read for the page). */
async function withBatches(actor: Actor, draws: DrawDto[]): Promise<DrawDto[]> {
  const map = await drawBatches(actor.coop.id, actor.coop.units, draws.map((d) => d.id));
  for (const d of draws) d.batches = map.get(d.id) ?? [];
  return draws;
}

/** One draw: a member sees their own, brewers/treasurers/admins any of the co-op's; else 404. */
export async function getDraw(actor: Actor, id: number): Promise<DrawDto> {
  const row = (await Draw.findOne({
    attributes: [...DRAW_ATTRIBUTES], where: { id, coopId: actor.coop.id }, include: drawInclude(actor.coop.id), raw: true, nest: true,
  })) as unknown as DrawListRow | null;
  if (!row || (row.membershipId !== actor.membershipId && !can(actor.role, 'draws:read-all'))) throw notFound('Draw not found.');
  return withBatches(actor, [drawDto(row, actor)]).then(([d]) => d!);
}

const DRAW_SORT = { occurred_at: 'occurredAt', quantity: 'quantityLiters', total: 'totalCents' } as const;

/**
 * Draws of the co-op, a page at a time, with totals for the filter. Members see their own;
 * draws:read-all roles see all and may filter by member, tank, status and date (co-op's days).
 */
export async function listDraws(actor: Actor, q: z.infer<typeof drawListSchema>, opts: { own?: boolean } = {}) {
  const own = opts.own || !can(actor.role, 'draws:read-all');
  const tz = actor.coop.timezone;
  const coopId = actor.coop.id;
  const conds: WhereOptions<Draw>[] = [{ coopId }];
  if (own) conds.push({ membershipId: actor.membershipId });
  else if (q.membershipId) conds.push({ membershipId: q.membershipId });
  if (q.tankId) conds.push({ tankId: q.tankId });
  // Reversed or not is read through the joined reversal ($reversal.id$).
  if (q.status === 'reversal') conds.push({ reversesDrawId: { [Op.ne]: null } });
  if (q.status === 'reversed') conds.push({ reversesDrawId: null, '$reversal.id$': { [Op.ne]: null } });
  if (q.status === 'recorded') conds.push({ reversesDrawId: null, '$reversal.id$': null });
  const from = q.from ? parseWindowEdge(q.from, tz, false) : null;
  const to = q.to ? parseWindowEdge(q.to, tz, true) : null;
  if (from) conds.push({ occurredAt: { [Op.gte]: from } });
  if (to) conds.push({ occurredAt: { [Op.lt]: to } });
  const where = { [Op.and]: conds };
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const [rows, agg] = await Promise.all([
    Draw.findAll({
      attributes: [...DRAW_ATTRIBUTES], where, include: drawInclude(coopId),
      order: [[DRAW_SORT[q.sort as keyof typeof DRAW_SORT], dir], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize, raw: true, nest: true,
    }) as unknown as Promise<DrawListRow[]>,
    Draw.findOne({
      attributes: [
        // The main table's alias is the model's name (minified in the production build).
        [fn('count', col(`${Draw.name}.id`)), 'n'],
        [fn('coalesce', fn('sum', col(`${Draw.name}.quantity_liters`)), 0), 'liters'],
        [fn('coalesce', fn('sum', col(`${Draw.name}.total_cents`)), 0), 'total'],
      ],
      where, include: drawInclude(coopId, false), raw: true,
    }) as unknown as Promise<{ n: string; liters: string; total: string } | null>,
  ]);
  const netMl = litersToMl(String(agg?.liters ?? '0'));
  return {
    items: await withBatches(actor, rows.map((r) => drawDto(r, actor))), page: q.page, pageSize: q.pageSize, total: Number(agg?.n ?? 0),
    totals: { quantityLiters: netMl / 1000, quantity: mlToUnits3(netMl, actor.coop.units), totalCents: Number(agg?.total ?? 0) },
  };
}

/** Active members of the co-op for the draw form and the filters (draws:read-all roles). */
export async function listDrawMembers(actor: Actor): Promise<{ membershipId: number; name: string }[]> {
  if (!can(actor.role, 'draws:read-all')) return [{ membershipId: actor.membershipId, name: actor.user.name }];
  const rows = (await Membership.findAll({
    attributes: ['id'], where: { coopId: actor.coop.id, status: 'active' },
    include: [{ model: User, as: 'user', attributes: ['name'], required: true }],
    order: [[{ model: User, as: 'user' }, 'name', 'ASC'], ['id', 'ASC']], raw: true, nest: true,
  })) as unknown as (Pick<InferAttributes<Membership>, 'id'> & { user: { name: string } })[];
  return rows.map((m) => ({ membershipId: m.id, name: m.user.name }));
}

/**
 * The pump meter's last reading per tank (from its latest metered draw), in the co-op's units,
 * to pre-fill "meter before" on the draw form. Looks at the latest 200 metered draws only.
 */
export async function lastMeterReadings(actor: Actor): Promise<Record<number, number>> {
  const rows = (await Draw.findAll({
    attributes: ['tankId', 'meterAfter'], where: { coopId: actor.coop.id, meterAfter: { [Op.ne]: null } },
    order: [['occurredAt', 'DESC'], ['id', 'DESC']], limit: 200, raw: true,
  })) as Pick<InferAttributes<Draw>, 'tankId' | 'meterAfter'>[];
  const out: Record<number, number> = {};
  for (const r of rows) if (!(r.tankId in out) && r.meterAfter !== null) out[r.tankId] = mlToUnits3(litersToMl(r.meterAfter), actor.coop.units);
  return out;
}
