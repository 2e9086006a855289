import 'server-only';
import type { Actor } from '@/lib/auth';
import { batchCost, consumeFifo, energyCostCents, estimateHeatingKwh, type FifoLotByTotal } from '@/lib/costing';
import { roundHalfUp } from '@/lib/money';
import { stockState, summarizeStock } from '@/lib/supplies';
import { fToC, litersToGallons, volumeToLiters } from '@/lib/units';
import type { PlannerInput } from '@/lib/validation/brewing';
import { computePlan, type ComputedPlan } from './plan';
import { feedstockShareCents } from './read';
import { resolveTitration } from './records';

/** Stock check and projected cost of one chemical for a planned batch. */
export interface ChemicalCoverage {
  kind: 'methanol' | 'KOH' | 'NaOH';
  unit: 'L' | 'g';
  needed: number;
  /** Stock the lots hold minus what batches under way will take. */
  available: number;
  covered: boolean;
  shortBy: number;
  /** Cost of the needed quantity at current lot prices, FIFO after the batches under way (what is covered). */
  projectedCents: number;
}

/** The planner's answer: the chemistry, the stock check and the projected costs. */
export interface PlannerResult {
  units: 'us' | 'metric';
  plan: ComputedPlan;
  coverage: ChemicalCoverage[];
  projected: {
    methanolCents: number;
    catalystCents: number;
    energyCents: number;
    energySource: 'metered' | 'heater' | 'estimate' | 'none';
    energyKwh: number | null;
    feedstockCents: number;
    totalCents: number;
    /** Per US gallon of expected fuel; null without expected fuel. */
    costPerGallonCents: number | null;
    costPerLiterCents: number | null;
    /** True when some chemical is short, so the projection leaves part of it unpriced. */
    incomplete: boolean;
  };
  notes: string[];
}

/** Reaction temperature the heating estimate aims for, °C (≈ 55 °C, common practice). */
const REACTION_TARGET_C = fToC(131); // common practice (130–135 °F)
/** Starting oil temperature assumed by the heating estimate, °C (room temperature; an assumption). */
const ASSUMED_START_C = 20;

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
  // have committed, and the titration (the trials given, or the chosen oil lot's), read in parallel.
  const [{ lots, needs }, { titration, lot }] = await Promise.all([stockState(actor.coop.id), resolveTitration(actor, input)]);
  const stock = summarizeStock(lots, needs);
  const purity = input.purityPct === undefined ? (lots.find((l) => l.kind === catalyst)?.purityPct ?? null) : null;
  const plan = computePlan({ ...input, oilLiters, titration, nextLotPurityPct: purity }, actor.coop.settings.recipe);
  const notes: string[] = [];

  const coverage: ChemicalCoverage[] = ([['methanol', plan.methanol.liters, 'L'], [catalyst, plan.catalystResult.totalGrams, 'g']] as const).map(([kind, needed, unit]) => {
    const line = stock.lines.find((l) => l.kind === kind)!;
    const fifo: FifoLotByTotal[] = lots
      .filter((l) => l.kind === kind)
      .map((l) => ({ id: l.id, receivedAt: l.receivedAtMs, qty: l.quantity, remainingQty: l.remaining, totalCostCents: l.totalCostCents }));
    const { cents, shortBy } = projectCost(fifo, line.committed, Math.round(needed * 1000) / 1000);
    return { kind, unit, needed, available: line.available, covered: shortBy <= 0, shortBy, projectedCents: cents };
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
    energyKwh = estimateHeatingKwh(oilLiters, ASSUMED_START_C, REACTION_TARGET_C);
    energySource = 'estimate';
    energyCents = energyCostCents({ kwh: energyKwh, tariffCentsPerKwh: tariff });
    notes.push('Energy is estimated from heating the oil from 20 °C to about 55 °C with no losses; real heaters use more.');
  } else {
    notes.push('Energy is not included: give the electricity tariff to include it.');
  }

  let feedstockCents = 0;
  if (lot) feedstockCents = feedstockShareCents(lot.costCents, Math.min(oilLiters, lot.volumeLiters).toFixed(3), lot.volumeLiters.toFixed(3));
  else notes.push('Feedstock cost is not included: choose the oil lot to include its cost.');

  const methanolCents = coverage[0]!.projectedCents;
  const catalystCents = coverage[1]!.projectedCents;
  const fuelGallons = litersToGallons(plan.yields.fuelLiters);
  const cost = batchCost({ chemicalsCents: methanolCents + catalystCents, energyCents, feedstockCents, otherCents: 0, gallonsReleased: fuelGallons });
  const incomplete = coverage.some((c) => !c.covered);
  if (incomplete) notes.push('Stock does not cover every chemical: the projection prices only what is in stock.');
  if (plan.oil.needsAcidPretreatment) notes.push(plan.oil.message);

  return {
    units,
    plan,
    coverage,
    projected: {
      methanolCents, catalystCents, energyCents, energySource, energyKwh, feedstockCents, totalCents: cost.totalCents,
      costPerGallonCents: cost.costPerGallonCents,
      costPerLiterCents: plan.yields.fuelLiters > 0 ? roundHalfUp(cost.totalCents / plan.yields.fuelLiters) : null,
      incomplete,
    },
    notes,
  };
}
