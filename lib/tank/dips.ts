import 'server-only';
import type { dipResultSchema } from '@/lib/api/dto/tank';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, invalidFields } from '@/lib/http';
import { roundHalfUp } from '@/lib/money';
import { expireLapsedReservations } from '@/lib/tank/reservations/expire';
import type { dipCreateSchema } from '@/lib/validation/tank';
import { DipReading } from '@/models';
import { getTank, lockTank } from './index';
import { recordMovement } from './ledger';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnits, mlToUnits3 } from './volume';

export type DipResult = z.infer<typeof dipResultSchema>;

/**
 * Records a dip reading: the measured volume against the book figure. A difference becomes one
 * 'dip-adjustment' ledger row with its reason (a gain is valued at `unitCost` when given, e.g. an
 * opening balance, otherwise at the tank's average cost; a loss leaves at average cost). The
 * reading may not fall below what members have reserved (409). Lapsed reservations are marked
 * expired first, so they no longer count.
 */
export async function recordDip(
  actor: Actor,
  tankId: number,
  input: z.infer<typeof dipCreateSchema>,
): Promise<DipResult> {
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
      throw invalidFields({
        measured: [
          `${tank.name} holds at most ${formatMl(capacityMl, units)}. Check the reading, or correct the tank's capacity first.`,
        ],
      });
    }
    if (diffMl !== 0 && !input.reason) {
      throw invalidFields({
        reason: ['Say why the tank differs from the book (e.g. evaporation, a spill, meter drift).'],
      });
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
      const valueCents =
        diffMl > 0 && input.unitCost !== undefined ? roundHalfUp(input.unitCost * mlToUnits(diffMl, units)) : undefined;
      const moved = await recordMovement(transaction, {
        coopId: actor.coop.id,
        tankId,
        kind: 'dip-adjustment',
        quantityMl: diffMl,
        valueCents,
        reason: input.reason ?? null,
        userId: actor.user.id,
      });
      movementId = moved.id;
    }
    const dip = await DipReading.create(
      {
        coopId: actor.coop.id,
        tankId,
        measuredLiters: mlToLiters(measuredMl),
        bookLiters: mlToLiters(bookMl),
        movementId,
        reason: input.reason ?? null,
        createdByUserId: actor.user.id,
      },
      { transaction },
    );
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'tank.dip',
        entityType: 'tank',
        entityId: tankId,
        before: { onHandLiters: mlToLiters(bookMl) },
        after: {
          onHandLiters: mlToLiters(measuredMl),
          differenceLiters: mlToLiters(diffMl),
          reason: input.reason ?? null,
          movementId,
        },
      },
      transaction,
    );
    return { dipReadingId: dip.id, diffMl, movementId };
  });
  return {
    tank: await getTank(actor, tankId),
    dipReadingId: result.dipReadingId,
    movementId: result.movementId,
    differenceLiters: result.diffMl / 1000,
    difference: mlToUnits3(result.diffMl, units),
  };
}
