import 'server-only';
import { Op, type Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { HttpError } from '@/lib/http';
import { getOilLot } from '@/lib/supplies/oil-lots';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { BatchOilLot, ChemicalLot } from '@/models';
import type { Catalyst, ComputedPlan, PlanInput } from './plan';

// What a batch's plan is made from (titration, next lot's purity) and how it is written: the plan
// columns and the oil lots it uses. Shared by creating a batch, changing its plan and the planner.

/** A 422 naming the fields (the batch write paths' one shape for bad input). */
export const fieldError = (fields: Record<string, string[]>, message = 'Some fields need attention.') =>
  new HttpError(422, message, fields);

/** Purity of the catalyst lot FIFO would use next (the planner's default purity). */
export async function nextLotPurity(
  coopId: number,
  catalyst: Catalyst,
  transaction?: Transaction,
): Promise<number | null> {
  const row = await ChemicalLot.findOne({
    attributes: ['purityPct'],
    where: { coopId, kind: catalyst, remainingQuantity: { [Op.gt]: 0 } },
    order: [
      ['receivedOn', 'ASC'],
      ['id', 'ASC'],
    ],
    raw: true,
    transaction,
  });
  return row?.purityPct ? Number(row.purityPct) : null;
}

/**
 * Resolves the titration of a plan: typed trials, else the chosen oil lot's titration.
 * A lot of another co-op, or one without a titration, is a 422 on oilLotId.
 */
export async function resolveTitration(
  actor: Actor,
  input: { titrationTrials?: number[]; oilLotId?: number; titrant?: 'KOH' | 'NaOH' },
  transaction?: Transaction,
): Promise<{ titration: PlanInput['titration']; lot: Awaited<ReturnType<typeof getOilLot>> | null }> {
  let lot: Awaited<ReturnType<typeof getOilLot>> | null = null;
  if (input.oilLotId !== undefined) {
    try {
      lot = await getOilLot(actor, input.oilLotId, transaction);
    } catch (e) {
      if (e instanceof HttpError && e.status === 404)
        throw fieldError({ oilLotId: ['Choose one of your co-op’s oil lots.'] });
      throw e;
    }
  }
  if (input.titrationTrials && input.titrationTrials.length > 0) {
    return {
      titration: {
        source: 'trials',
        trials: input.titrationTrials,
        ...(input.titrant ? { titrant: input.titrant } : {}),
      },
      lot,
    };
  }
  if (lot && lot.titrationMl !== null && lot.titrant) {
    return { titration: { source: 'oil-lot', trials: [lot.titrationMl], titrant: lot.titrant, oilLotId: lot.id }, lot };
  }
  if (lot) throw fieldError({ titrationTrials: ['This oil lot has no titration: enter the trials.'] });
  throw fieldError({
    titrationTrials: ['Enter at least one titration trial, or choose an oil lot that has a titration.'],
  });
}

/** Checks and writes the oil lots a batch uses (each within what the lot still holds). */
export async function writeOilLots(
  actor: Actor,
  batchId: number,
  oilLiters: number,
  uses: { oilLotId: number; liters: number }[],
  t: Transaction,
) {
  const ids = new Set<number>();
  let totalMl = 0;
  for (const [i, use] of uses.entries()) {
    if (ids.has(use.oilLotId)) throw fieldError({ [`oilLots.${i}.oilLotId`]: ['This oil lot is listed twice.'] });
    ids.add(use.oilLotId);
    let lot;
    try {
      lot = await getOilLot(actor, use.oilLotId, t);
    } catch (e) {
      if (e instanceof HttpError && e.status === 404)
        throw fieldError({ [`oilLots.${i}.oilLotId`]: ['Choose one of your co-op’s oil lots.'] });
      throw e;
    }
    const mine = await BatchOilLot.findOne({
      attributes: ['liters'],
      where: { batchId, oilLotId: lot.id, coopId: actor.coop.id },
      raw: true,
      transaction: t,
    });
    const freeMl = litersToMl(lot.remainingLiters) + (mine ? litersToMl(mine.liters) : 0);
    const useMl = litersToMl(use.liters.toFixed(3));
    if (useMl > freeMl) {
      throw fieldError({
        [`oilLots.${i}.volume`]: [`The lot from ${lot.collectedFrom} has only ${mlToLiters(freeMl)} L left.`],
      });
    }
    totalMl += useMl;
  }
  if (totalMl > litersToMl(oilLiters.toFixed(3)))
    throw fieldError({ oilLots: ['The oil lots add up to more than the batch’s oil volume.'] });
  await BatchOilLot.destroy({ where: { batchId, coopId: actor.coop.id }, transaction: t });
  if (uses.length) {
    await BatchOilLot.bulkCreate(
      uses.map((u) => ({ coopId: actor.coop.id, batchId, oilLotId: u.oilLotId, liters: u.liters.toFixed(3) })),
      { transaction: t },
    );
  }
}

/** Plan columns of the batches table from a computed plan. */
export function planColumns(plan: ComputedPlan) {
  return {
    oilLiters: plan.oilLiters.toFixed(3),
    titrationTrialsMl: plan.titration.trials,
    titrationBlankMl: plan.titration.blankMl.toFixed(2),
    titrationSource: plan.titration.source,
    titrant: plan.titration.titrant,
    titrationAvgMl: plan.titration.averageMl.toFixed(4),
    catalyst: plan.catalyst,
    baseGPerL: plan.baseGramsPerLiter.toFixed(3),
    purityPct: plan.purityPct.toFixed(2),
    titrantFrom: plan.titrantFrom,
    catalystRule: plan.catalystResult.rule,
    methanolMode: plan.methanol.mode,
    methanolPct: plan.methanol.pct === null ? null : plan.methanol.pct.toFixed(2),
    molarRatio: plan.methanol.molarRatio === null ? null : plan.methanol.molarRatio.toFixed(2),
    computedCatalystGrams: plan.catalystResult.totalGrams.toFixed(3),
    computedMethanolLiters: plan.methanol.liters.toFixed(3),
  };
}
