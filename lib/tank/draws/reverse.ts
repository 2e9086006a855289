import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { inTransaction, sqlState } from '@/lib/db';
import { conflict, notFound } from '@/lib/http';
import { lockTank } from '@/lib/tank';
import { recordMovement } from '@/lib/tank/ledger';
import { drawShares, type LineageSource } from '@/lib/tank/lineage';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import type { drawReverseSchema } from '@/lib/validation/tank';
import { Draw } from '@/models';
import { getDraw, type DrawDto } from './index';
import { nextDrawId } from './queries';

/**
 * Corrects a draw the only way allowed: a reversing entry. A new draws row with negative
 * quantity and amounts (same locked rates), the reason, and a 'draw-reversal' ledger row that
 * puts the fuel and the exact value it took back into the tank. A draw is reversed at most once
 * (UNIQUE reverses_draw_id); a reversal cannot itself be reversed — record a new draw instead.
 */
export async function reverseDraw(
  actor: Actor,
  drawId: number,
  input: z.infer<typeof drawReverseSchema>,
): Promise<DrawDto> {
  let reversalId: number;
  try {
    reversalId = await inTransaction(async (t) => {
      const d = await Draw.findOne({
        where: { id: drawId, coopId: actor.coop.id },
        lock: t.LOCK.UPDATE,
        transaction: t,
        raw: true,
      });
      if (!d) throw notFound('Draw not found.');
      if (d.reversesDrawId !== null)
        throw conflict('This entry is itself a reversal and cannot be reversed; record a new draw instead.');
      const reversal = await Draw.findOne({
        attributes: ['id'],
        where: { reversesDrawId: d.id, coopId: actor.coop.id },
        transaction: t,
        raw: true,
      });
      if (reversal)
        throw conflict(`This draw was already reversed (entry #${reversal.id}).`, { reversedByDrawId: reversal.id });
      const tank = await lockTank(actor.coop.id, d.tankId, t);
      if (!tank.active) throw conflict(`${tank.name} is out of service; put it back in service to return fuel to it.`);
      const qMl = litersToMl(d.quantityLiters);
      const id = await nextDrawId(t);
      const moved = await recordMovement(t, {
        coopId: actor.coop.id,
        tankId: d.tankId,
        kind: 'draw-reversal',
        quantityMl: qMl,
        valueCents: Number(d.costValueCents),
        drawId: id,
        reason: input.reason,
        userId: actor.user.id,
        lineage: await reversalSource(t, actor.coop.id, d.id),
      });
      const neg = (v: string) => String(-Number(v));
      await Draw.create(
        {
          id,
          coopId: actor.coop.id,
          tankId: d.tankId,
          membershipId: d.membershipId,
          reservationId: null,
          quantityLiters: mlToLiters(-qMl),
          meterBefore: null,
          meterAfter: null,
          declaredUse: d.declaredUse,
          vehicle: d.vehicle,
          pricePolicyId: d.pricePolicyId,
          unitPriceCentsPerGallon: d.unitPriceCentsPerGallon,
          surchargeCentsPerGallon: d.surchargeCentsPerGallon,
          roadTaxCentsPerGallon: d.roadTaxCentsPerGallon,
          fuelCents: neg(d.fuelCents),
          surchargeCents: neg(d.surchargeCents),
          taxCents: neg(d.taxCents),
          totalCents: neg(d.totalCents),
          costValueCents: neg(d.costValueCents),
          reversesDrawId: d.id,
          reason: input.reason,
          recordedByUserId: actor.user.id,
        },
        { transaction: t },
      );
      await audit(
        {
          coopId: actor.coop.id,
          actorUserId: actor.user.id,
          action: 'draw.reverse',
          entityType: 'draw',
          entityId: d.id,
          before: { drawId: d.id, reversed: false },
          after: {
            reversalDrawId: id,
            reason: input.reason,
            quantityLiters: mlToLiters(-qMl),
            totalCents: -Number(d.totalCents),
            movementId: moved.id,
          },
        },
        t,
      );
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
