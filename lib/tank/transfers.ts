import 'server-only';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction } from '@/lib/db';
import { conflict, HttpError, invalidFields } from '@/lib/http';
import { expireLapsedReservations } from '@/lib/tank/reservations/expire';
import type { transferCreateSchema } from '@/lib/validation/tank';
import { getTank, lockTank, type TankDto } from './index';
import { recordMovement } from './ledger';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { formatMl, milliUnitsToMl, mlToUnitsFloor, coveredMl, tankAvailableMl } from './volume';

/**
 * Moves fuel between two tanks of the co-op: two ledger rows in one transaction; the value
 * leaves the source at its average cost and arrives with the fuel. Only available fuel moves
 * (reserved fuel stays), and the destination's capacity is respected.
 */
export async function transferFuel(
  actor: Actor,
  input: z.infer<typeof transferCreateSchema>,
): Promise<{ from: TankDto; to: TankDto }> {
  const units = actor.coop.units;
  let qMl = milliUnitsToMl(input.quantity, units);
  await inTransaction(async (transaction) => {
    await expireLapsedReservations(actor.coop.id, transaction);
    // Lock in id order so two opposite transfers cannot deadlock.
    const [firstId, secondId] =
      input.fromTankId < input.toTankId ? [input.fromTankId, input.toTankId] : [input.toTankId, input.fromTankId];
    const first = await lockTank(actor.coop.id, firstId, transaction).catch(() => null);
    const second = await lockTank(actor.coop.id, secondId, transaction).catch(() => null);
    const from = first?.id === input.fromTankId ? first : second;
    const to = first?.id === input.toTankId ? first : second;
    const fields: Record<string, string[]> = {};
    if (!from) fields.fromTankId = ['No such tank in this co-op.'];
    if (!to) fields.toTankId = ['No such tank in this co-op.'];
    if (!from || !to) throw invalidFields(fields);
    if (!from.active || !to.active) throw conflict(`${!from.active ? from.name : to.name} is out of service.`);
    const availableMl = tankAvailableMl(
      litersToMl(from.onHandLiters),
      litersToMl(from.reservedLiters),
      litersToMl(from.heldLiters),
    );
    const coveredQMl = coveredMl(qMl, availableMl, units);
    if (coveredQMl === null) {
      throw new HttpError(
        409,
        `${from.name} has only ${formatMl(availableMl, units, { floor: true })} available to move (reserved fuel and fuel held for a batch review stay put).`,
        { quantity: ['More than is available.'] },
        {
          availableLiters: availableMl / 1000,
          available: mlToUnitsFloor(availableMl, units),
        },
      );
    }
    qMl = coveredQMl;
    const roomMl = litersToMl(to.capacityLiters) - litersToMl(to.onHandLiters);
    if (qMl > roomMl) {
      throw new HttpError(409, `${to.name} has room for only ${formatMl(roomMl, units, { floor: true })}.`, {
        quantity: ['More than the destination can hold.'],
      });
    }
    const out = await recordMovement(transaction, {
      coopId: actor.coop.id,
      tankId: from.id,
      kind: 'transfer-out',
      quantityMl: -qMl,
      transferTankId: to.id,
      reason: input.reason ?? null,
      userId: actor.user.id,
    });
    const inn = await recordMovement(transaction, {
      coopId: actor.coop.id,
      tankId: to.id,
      kind: 'transfer-in',
      quantityMl: qMl,
      valueCents: -out.valueCents,
      transferTankId: from.id,
      reason: input.reason ?? null,
      userId: actor.user.id,
      lineage: { kind: 'shares', shares: out.shares },
    });
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'tank.transfer',
        entityType: 'tank',
        entityId: from.id,
        before: { fromOnHandLiters: from.onHandLiters, toOnHandLiters: to.onHandLiters },
        after: {
          toTankId: to.id,
          quantityLiters: mlToLiters(qMl),
          valueCents: -out.valueCents,
          movementIds: [out.id, inn.id],
        },
      },
      transaction,
    );
  });
  return { from: await getTank(actor, input.fromTankId), to: await getTank(actor, input.toTankId) };
}
