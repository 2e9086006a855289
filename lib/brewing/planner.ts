import 'server-only';
import type { z } from 'zod';
import type { chemicalCoverageSchema, plannerResultSchema } from '@/lib/api/dto/brewing';
import type { Actor } from '@/lib/auth';
import { batchCost, consumeFifo, energyCostCents, estimateHeatingKwh, type FifoLotByTotal } from '@/lib/costing';
import { YIELD_HISTORY_BATCHES } from '@/lib/chemistry';
import { formatCents, roundHalfUp } from '@/lib/money';
import { stockState, summarizeStock } from '@/lib/supplies/stock';
import { formatTemp, fToC, litersToGallons, tempToC, volumeToLiters } from '@/lib/units';
import type { PlannerInput } from '@/lib/validation/brewing';
import { computePlan } from './plan';
import { feedstockShareCents } from './read';
import { resolveTitration } from './plan-inputs';
import { plannerHistory } from './queries';

/** Stock check and projected cost of one chemical for a planned batch (the API's ChemicalCoverage). */
export type ChemicalCoverage = z.infer<typeof chemicalCoverageSchema>;

/** The planner's answer: the chemistry, the stock check and the projected costs (the API's PlannerResult). */
export type PlannerResult = z.infer<typeof plannerResultSchema>;

/** Reaction temperature the heating estimate aims for, °C (≈ 55 °C, common practice). */
const REACTION_TARGET_C = fToC(131); // common practice (130–135 °F)
/** Starting oil temperature when the brewer gives none, °C (room temperature; an assumption the note states). */
const ASSUMED_START_C = 20;

/**
 * The co-op's most recent released (or imported past) batches (oil in, fuel out), newest first,
 * for the yield projection; and cents per unit (L or g) of the last lot bought of each of `kinds`,
 * for pricing a shortfall. One statement (lib/brewing/queries.ts).
 */
async function historyAndPrices(coopId: number, kinds: readonly string[]) {
  const { history, prices } = await plannerHistory({ coopId, historyLimit: YIELD_HISTORY_BATCHES, kinds: [...kinds] });
  return {
    history: history.map((r) => ({ oilLiters: Number(r.oilLiters), releasedLiters: Number(r.releasedLiters) })),
    prices: new Map(prices.map((r) => [r.kind, Number(r.totalCostCents) / Number(r.quantity)])),
  };
}

/** Prices `need` after `committed` has been taken from the same lots (batches under way go first). */
function projectCost(lots: FifoLotByTotal[], committed: number, need: number): { cents: number; shortBy: number } {
  const first = consumeFifo(lots, Math.max(0, committed));
  const left = lots.map((l) => {
    const a = first.allocations.find((x) => x.lotId === l.id);
    return a ? { ...l, remainingQty: a.remainingQtyAfter } : l;
  });
  const r = consumeFifo(left, need);
  return { cents: r.totalCostCents, shortBy: r.shortfallQty };
}

/**
 * The batch planner (compute only; writes nothing): the chemistry for an oil volume and its
 * titration, whether stock covers the chemicals, and the projected cost per gallon at the current
 * FIFO lot prices (after the batches already under way), with expected glycerin and fuel.
 * @param actor brewer or admin
 * @param input validated plannerSchema (volumes in the co-op's units)
 */
export async function planBatch(actor: Actor, input: PlannerInput): Promise<PlannerResult> {
  const units = actor.coop.units;
  const oilLiters = volumeToLiters(input.oilVolume, units);
  const catalyst = input.catalyst ?? actor.coop.settings.recipe?.catalyst ?? 'KOH';
  // The lots holding stock (FIFO order; also gives the next lot's purity), what batches under way
  // have committed, the titration (the trials given, or the chosen oil lot's), the yield history
  // and the last prices paid, read in parallel.
  const [{ lots, needs }, { titration, lot }, { history, prices }] = await Promise.all([
    stockState(actor.coop.id),
    resolveTitration(actor, input),
    historyAndPrices(actor.coop.id, ['methanol', catalyst]),
  ]);
  const stock = summarizeStock(lots, needs);
  const purity = input.purityPct === undefined ? (lots.find((l) => l.kind === catalyst)?.purityPct ?? null) : null;
  const plan = computePlan({ ...input, oilLiters, titration, nextLotPurityPct: purity }, actor.coop.settings.recipe, {
    system: units,
    yieldHistory: history,
  });
  const notes: string[] = [];

  const coverage: ChemicalCoverage[] = (
    [
      ['methanol', plan.methanol.liters, 'L'],
      [catalyst, plan.catalystResult.totalGrams, 'g'],
    ] as const
  ).map(([kind, needed, unit]) => {
    const line = stock.lines.find((l) => l.kind === kind)!;
    const fifo: FifoLotByTotal[] = lots
      .filter((l) => l.kind === kind)
      .map((l) => ({
        id: l.id,
        receivedAt: l.receivedAtMs,
        qty: l.quantity,
        remainingQty: l.remaining,
        totalCostCents: l.totalCostCents,
      }));
    const { cents, shortBy } = projectCost(fifo, line.committed, Math.round(needed * 1000) / 1000);
    const last = prices.get(kind);
    const shortfallCents = shortBy > 0 && last !== undefined ? roundHalfUp(shortBy * last) : null;
    return {
      kind,
      unit,
      needed,
      available: line.available,
      covered: shortBy <= 0,
      shortBy,
      projectedCents: cents + (shortfallCents ?? 0),
      shortfallCents,
    };
  });

  let energyCents = 0;
  let energySource: PlannerResult['projected']['energySource'] = 'none';
  let energyKwh: number | null = null;
  const tariff = input.tariffCentsPerKwh;
  if (tariff !== undefined && input.energyKwh !== undefined) {
    [energyKwh, energySource] = [input.energyKwh, 'metered'];
    energyCents = energyCostCents({ kwh: input.energyKwh, tariffCentsPerKwh: tariff });
  } else if (tariff !== undefined && input.heaterKw !== undefined && input.heaterHours !== undefined) {
    [energyKwh, energySource] = [input.heaterKw * input.heaterHours, 'heater'];
    energyCents = energyCostCents({ heaterKw: input.heaterKw, hours: input.heaterHours, tariffCentsPerKwh: tariff });
  } else if (tariff !== undefined) {
    const startC = input.startTemp === undefined ? ASSUMED_START_C : tempToC(input.startTemp, units);
    energyKwh = estimateHeatingKwh(oilLiters, startC, REACTION_TARGET_C);
    energySource = 'estimate';
    energyCents = energyCostCents({ kwh: energyKwh, tariffCentsPerKwh: tariff });
    notes.push(
      `Energy is estimated from heating the oil from ${formatTemp(startC, units, 0)}${input.startTemp === undefined ? ' (assumed room temperature: give the oil’s start temperature for a better estimate)' : ''} to about ${formatTemp(REACTION_TARGET_C, units, 0)} with no losses; real heaters use more.`,
    );
  } else {
    notes.push('Energy is not included: give the electricity tariff to include it.');
  }

  let feedstockCents = 0;
  if (lot)
    feedstockCents = feedstockShareCents(
      lot.costCents,
      Math.min(oilLiters, lot.volumeLiters).toFixed(3),
      lot.volumeLiters.toFixed(3),
    );
  else notes.push('Feedstock cost is not included: choose the oil lot to include its cost.');

  const methanolCents = coverage[0]!.projectedCents;
  const catalystCents = coverage[1]!.projectedCents;
  const fuelLiters = plan.projectedFuelLiters;
  const fuelGallons = litersToGallons(fuelLiters);
  const cost = batchCost({
    chemicalsCents: methanolCents + catalystCents,
    energyCents,
    feedstockCents,
    otherCents: 0,
    gallonsReleased: fuelGallons,
  });
  for (const c of coverage.filter((x) => !x.covered)) {
    const name = c.kind === 'methanol' ? 'methanol' : c.kind;
    const amount =
      c.unit === 'L'
        ? `${(units === 'us' ? litersToGallons(c.shortBy) : c.shortBy).toFixed(2)} ${units === 'us' ? 'gal' : 'L'}`
        : `${Math.ceil(c.shortBy)} g`;
    notes.push(
      c.shortfallCents === null
        ? `Short of ${name} by ${amount}, and none has been bought before: the projection leaves the shortfall unpriced.`
        : `Short of ${name} by ${amount}: the shortfall is priced at the last price paid (${formatCents(c.shortfallCents)}).`,
    );
  }
  const incomplete = coverage.some((c) => !c.covered && c.shortfallCents === null);
  notes.push(plan.yieldProjection.explanation);
  if (plan.oil.needsAcidPretreatment) notes.push(plan.oil.message);

  return {
    units,
    plan,
    coverage,
    projected: {
      methanolCents,
      catalystCents,
      energyCents,
      energySource,
      energyKwh,
      feedstockCents,
      totalCents: cost.totalCents,
      costPerGallonCents: cost.costPerGallonCents,
      costPerLiterCents: fuelLiters > 0 ? roundHalfUp(cost.totalCents / fuelLiters) : null,
      incomplete,
    },
    notes,
  };
}
