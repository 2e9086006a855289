import 'server-only';
import type { InferAttributes } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import { can, type Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, forbidden, HttpError, invalidFields } from '@/lib/http';
import { policyInForce } from '@/lib/tank/pricing-policy';
import { priceDraw } from '@/lib/tank/pricing-policy/convert';
import { expireLapsedReservations } from '@/lib/tank/reservations/expire';
import { parseInstant } from '@/lib/tank/reservations/window';
import { lockTank } from '@/lib/tank';
import { recordMovement } from '@/lib/tank/ledger';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnitsFloor, coveredMl, tankAvailableMl } from '@/lib/tank/volume';
import { drawQuantityMilli, type drawCreateSchema } from '@/lib/validation/tank';
import { Draw, Membership, Reservation, Tank } from '@/models';
import { getDraw, type DrawDto } from './index';
import { nextDrawId } from './queries';

/**
 * Who may record draws: brewers and admins for anyone ('any'); a member for themself only when
 * the co-op runs a self-serve pump ('self'); otherwise 403. Call it before reading the body.
 */
export function drawRecorderScope(actor: Actor): 'any' | 'self' {
  if (can(actor.role, 'draws:record')) return 'any';
  if (actor.coop.settings?.selfServeDraws === true) return 'self';
  throw forbidden('Draws are recorded by the co-op’s brewers (this co-op has no self-serve pump).');
}

const bad = (fields: Record<string, string[]>) => invalidFields(fields);

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
    if (membershipId !== undefined && membershipId !== actor.membershipId)
      throw bad({ membershipId: ['At a self-serve pump you record only your own draws.'] });
    if (input.occurredAt !== undefined) throw bad({ occurredAt: ['Self-serve draws are recorded as they happen.'] });
    membershipId = actor.membershipId;
  }
  if (membershipId === undefined) throw bad({ membershipId: ['Choose the member who drew the fuel.'] });
  let occurredAt = new Date();
  if (input.occurredAt) {
    const t = parseInstant(input.occurredAt, actor.coop.timezone);
    if (!t) throw bad({ occurredAt: ['Enter a date and time.'] });
    if (t.getTime() > Date.now() + 5 * 60_000) throw bad({ occurredAt: ['A draw cannot be recorded in the future.'] });
    if (t.getTime() < Date.now() - 31 * 86_400_000)
      throw bad({ occurredAt: ['Draws older than 31 days cannot be entered; ask the treasurer for an adjustment.'] });
    occurredAt = t;
  }
  const qMilli = drawQuantityMilli(input);
  const meterBeforeMl = input.meterBefore !== undefined ? milliUnitsToMl(input.meterBefore, units) : null;
  const meterAfterMl = input.meterAfter !== undefined ? milliUnitsToMl(input.meterAfter, units) : null;
  let qMl =
    meterBeforeMl !== null && meterAfterMl !== null ? meterAfterMl - meterBeforeMl : milliUnitsToMl(qMilli, units);
  if (qMl <= 0) throw bad({ quantity: ['Enter a quantity greater than zero.'] });

  const id = await inTransaction(async (t) => {
    await expireLapsedReservations(actor.coop.id, t);
    const member = await Membership.findOne({
      attributes: ['id', 'status'],
      where: { id: membershipId, coopId: actor.coop.id },
      transaction: t,
      raw: true,
    });
    if (!member) throw bad({ membershipId: ['No such member in this co-op.'] });
    if (member.status !== 'active') throw bad({ membershipId: ['This member is suspended.'] });

    let reservation: Pick<InferAttributes<Reservation>, 'id' | 'quantityLiters'> | null = null;
    if (input.reservationId !== undefined) {
      const r = await Reservation.findOne({
        attributes: ['id', 'tankId', 'membershipId', 'quantityLiters', 'status'],
        where: { id: input.reservationId, coopId: actor.coop.id },
        lock: t.LOCK.UPDATE,
        transaction: t,
        raw: true,
      });
      if (!r || (scope === 'self' && r.membershipId !== actor.membershipId))
        throw bad({ reservationId: ['No such reservation in this co-op.'] });
      if (r.membershipId !== membershipId)
        throw bad({ reservationId: ['This reservation belongs to another member.'] });
      if (r.tankId !== input.tankId) throw bad({ reservationId: ['This reservation is for another tank.'] });
      if (r.status !== 'open') {
        throw conflict(
          r.status === 'expired'
            ? 'This reservation has expired (its window ended). Record the draw as a walk-up instead.'
            : `This reservation is already ${r.status}.`,
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
      await Tank.decrement(
        { reservedLiters: reservedByItMl / 1000 },
        { where: { id: tank.id, coopId: actor.coop.id }, transaction: t },
      );
      await Reservation.update(
        { status: 'drawn', closedAt: new Date() },
        { where: { id: reservation.id, coopId: actor.coop.id }, transaction: t },
      );
    }
    // Fuel held while a batch in the tank is under review cannot be drawn.
    const availableMl = tankAvailableMl(onHandMl, reservedMl, litersToMl(tank.heldLiters));
    const coveredQMl = coveredMl(qMl, availableMl, units);
    if (coveredQMl === null) {
      const what = reservation ? 'beyond the reservation' : 'for a walk-up draw';
      throw new HttpError(
        409,
        `${tank.name} can cover only ${formatMl(availableMl, units, { floor: true, digits: 3 })} ${what} (the rest is reserved by other members${Number(tank.heldLiters) > 0 ? ', held while a batch is under review' : ''} or not in the tank).`,
        { quantity: ['More than is available.'] },
        {
          availableLiters: availableMl / 1000,
          available: mlToUnitsFloor(availableMl, units),
        },
      );
    }
    qMl = coveredQMl;

    const policy = await policyInForce(actor.coop.id, t);
    if (!policy)
      throw conflict('No member price is set yet. The treasurer sets the pricing policy before draws can be recorded.');
    const pricing = priceDraw(
      policy,
      units,
      { onHandMl, valueCents: Number(tank.valueCents) },
      qMilli,
      input.declaredUse,
    );

    const drawId = await nextDrawId(t);
    const moved = await recordMovement(t, {
      coopId: actor.coop.id,
      tankId: tank.id,
      kind: 'draw',
      quantityMl: -qMl,
      drawId,
      userId: actor.user.id,
      occurredAt,
    });
    await Draw.create(
      {
        id: drawId,
        coopId: actor.coop.id,
        tankId: tank.id,
        membershipId,
        reservationId: reservation?.id ?? null,
        quantityLiters: mlToLiters(qMl),
        meterBefore: meterBeforeMl === null ? null : mlToLiters(meterBeforeMl),
        meterAfter: meterAfterMl === null ? null : mlToLiters(meterAfterMl),
        declaredUse: input.declaredUse,
        vehicle: input.vehicle || null,
        pricePolicyId: policy.id,
        unitPriceCentsPerGallon: String(pricing.locked.unitPriceCentsPerGallon),
        surchargeCentsPerGallon: String(pricing.locked.surchargeCentsPerGallon),
        roadTaxCentsPerGallon: String(pricing.locked.roadTaxCentsPerGallon),
        fuelCents: String(pricing.charge.fuelCents),
        surchargeCents: String(pricing.charge.surchargeCents),
        taxCents: String(pricing.charge.taxCents),
        totalCents: String(pricing.charge.totalCents),
        costValueCents: String(-moved.valueCents),
        recordedByUserId: actor.user.id,
        reason: null,
        reversesDrawId: null,
        occurredAt,
      },
      { transaction: t },
    );
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'draw.record',
        entityType: 'draw',
        entityId: drawId,
        before: reservation ? { reservationId: reservation.id, reservationStatus: 'open' } : null,
        after: {
          tankId: tank.id,
          membershipId,
          quantityLiters: mlToLiters(qMl),
          declaredUse: input.declaredUse,
          pricePolicyId: policy.id,
          perUnit: pricing.perUnit,
          charge: pricing.charge,
          costValueCents: -moved.valueCents,
          movementId: moved.id,
        },
      },
      t,
    );
    return drawId;
  });
  return getDraw(actor, id);
}
