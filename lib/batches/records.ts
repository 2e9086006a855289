import 'server-only';
import { Op, type Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { temperatureCheck } from '@/lib/chemistry';
import { conflict, HttpError } from '@/lib/http';
import { evaluateQuality, evaluateQuickTests, type FuelStandard, type QualityResults } from '@/lib/quality';
import { getOilLot } from '@/lib/supplies';
import { checkLowStock } from '@/lib/supplies/low-stock';
import { litersToMl, mlToLiters } from '@/lib/tank/quantity';
import { tempToC, volumeToLiters } from '@/lib/units';
import type { BatchCreateInput, BatchUpdateInput } from '@/lib/validation/brewing';
import { inTransaction } from '@/lib/db';
import { todayIn } from '@/lib/dates';
import { Batch, BatchOilLot, BatchTemperature, ChemicalLot } from '@/models';
import type { BatchStatus } from '@/models/Batch';
import { computePlan, type Catalyst, type ComputedPlan, type PlanInput } from './plan';
import { lockBatchNumbers } from './queries';
import {
  getBatch, labResultsOf, loadBatch, planInputOf, quickTestInput, quickTestsOf,
  type BatchDto, type BatchRecord, type QuickTestsStored, type TemperatureDto,
} from './read';

// Writing batches: create from a plan, record the steps, move forward, log temperatures.
// Release and rejection live in ./release.

/** The working steps in order; a batch only moves forward through them, then to released or rejected. */
export const STEPS = ['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;
export const FINAL: readonly BatchStatus[] = ['released', 'rejected', 'imported'];
const isFinal = (s: string) => (FINAL as readonly string[]).includes(s);

const fieldError = (fields: Record<string, string[]>, message = 'Some fields need attention.') => new HttpError(422, message, fields);

/** Purity of the catalyst lot FIFO would use next (the planner's default purity). */
export async function nextLotPurity(coopId: number, catalyst: Catalyst, transaction?: Transaction): Promise<number | null> {
  const row = await ChemicalLot.findOne({
    attributes: ['purityPct'], where: { coopId, kind: catalyst, remainingQuantity: { [Op.gt]: 0 } },
    order: [['receivedOn', 'ASC'], ['id', 'ASC']], raw: true, transaction,
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
      if (e instanceof HttpError && e.status === 404) throw fieldError({ oilLotId: ['Choose one of your co-op’s oil lots.'] });
      throw e;
    }
  }
  if (input.titrationTrials && input.titrationTrials.length > 0) {
    return { titration: { source: 'trials', trials: input.titrationTrials, ...(input.titrant ? { titrant: input.titrant } : {}) }, lot };
  }
  if (lot && lot.titrationMl !== null && lot.titrant) {
    return { titration: { source: 'oil-lot', trials: [lot.titrationMl], titrant: lot.titrant, oilLotId: lot.id }, lot };
  }
  if (lot) throw fieldError({ titrationTrials: ['This oil lot has no titration: enter the trials.'] });
  throw fieldError({ titrationTrials: ['Enter at least one titration trial, or choose an oil lot that has a titration.'] });
}

/** Checks and writes the oil lots a batch uses (each within what the lot still holds). */
async function writeOilLots(actor: Actor, batchId: number, oilLiters: number, uses: { oilLotId: number; liters: number }[], t: Transaction) {
  const ids = new Set<number>();
  let totalMl = 0;
  for (const [i, use] of uses.entries()) {
    if (ids.has(use.oilLotId)) throw fieldError({ [`oilLots.${i}.oilLotId`]: ['This oil lot is listed twice.'] });
    ids.add(use.oilLotId);
    let lot;
    try {
      lot = await getOilLot(actor, use.oilLotId, t);
    } catch (e) {
      if (e instanceof HttpError && e.status === 404) throw fieldError({ [`oilLots.${i}.oilLotId`]: ['Choose one of your co-op’s oil lots.'] });
      throw e;
    }
    const mine = await BatchOilLot.findOne({ attributes: ['liters'], where: { batchId, oilLotId: lot.id, coopId: actor.coop.id }, raw: true, transaction: t });
    const freeMl = litersToMl(lot.remainingLiters) + (mine ? litersToMl(mine.liters) : 0);
    const useMl = litersToMl(use.liters.toFixed(3));
    if (useMl > freeMl) {
      throw fieldError({ [`oilLots.${i}.volume`]: [`The lot from ${lot.collectedFrom} has only ${mlToLiters(freeMl)} L left.`] });
    }
    totalMl += useMl;
  }
  if (totalMl > litersToMl(oilLiters.toFixed(3))) throw fieldError({ oilLots: ['The oil lots add up to more than the batch’s oil volume.'] });
  await BatchOilLot.destroy({ where: { batchId, coopId: actor.coop.id }, transaction: t });
  if (uses.length) {
    await BatchOilLot.bulkCreate(
      uses.map((u) => ({ coopId: actor.coop.id, batchId, oilLotId: u.oilLotId, liters: u.liters.toFixed(3) })),
      { transaction: t },
    );
  }
}

/** Plan columns of the batches table from a computed plan. */
function planColumns(plan: ComputedPlan) {
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

/**
 * Creates a batch in status 'planned' from the planner's inputs: computes the plan, numbers the
 * batch (per co-op sequence under an advisory lock), records the oil lots it will use.
 * @param actor brewer or admin
 * @param input validated batchCreateSchema (volumes in the co-op's units)
 */
export async function createBatch(actor: Actor, input: BatchCreateInput): Promise<BatchDto> {
  const units = actor.coop.units;
  const oilLiters = volumeToLiters(input.oilVolume, units);
  const id = await inTransaction(async (t) => {
    const { titration, lot } = await resolveTitration(actor, input, t);
    const catalyst = input.catalyst ?? actor.coop.settings.recipe?.catalyst ?? 'KOH';
    const plan = computePlan(
      { ...input, oilLiters, titration, nextLotPurityPct: input.purityPct === undefined ? await nextLotPurity(actor.coop.id, catalyst, t) : null },
      actor.coop.settings.recipe,
      { system: units },
    );
    const uses = input.oilLots
      ? input.oilLots.map((u) => ({ oilLotId: u.oilLotId, liters: volumeToLiters(u.volume, units) }))
      : lot && lot.remainingLiters > 0
        ? [{ oilLotId: lot.id, liters: Math.min(oilLiters, lot.remainingLiters) }]
        : [];

    await lockBatchNumbers(actor.coop.id, t);
    const last = await Batch.max<number | null, Batch>('number', { where: { coopId: actor.coop.id }, transaction: t });
    const batch = await Batch.create(
      {
        coopId: actor.coop.id, number: Number(last ?? 0) + 1, ...planColumns(plan), batchDate: input.batchDate ?? todayIn(actor.coop.timezone),
        qualityStandard: actor.coop.settings.qualityStandard === 'EN 14214' ? 'EN 14214' : 'ASTM D6751',
        notes: input.notes ?? null, createdByUserId: actor.user.id,
      },
      { transaction: t },
    );
    await writeOilLots(actor, batch.id, oilLiters, uses, t);
    await audit({
      coopId: actor.coop.id, actorUserId: actor.user.id, action: 'batch.create', entityType: 'batch', entityId: batch.id,
      after: { number: batch.number, ...planColumns(plan), oilLots: uses },
    }, t);
    return batch.id;
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}

const PLAN_FIELDS = ['oilVolume', 'titrationTrials', 'titrationBlankMl', 'catalyst', 'baseGramsPerLiter', 'purityPct', 'titrantFrom', 'titrant', 'methanolMode', 'methanolPct', 'molarRatio', 'oilLots', 'batchDate'] as const;

/**
 * Records what was done at the batch's steps (and, while planned, changes the plan). Released
 * and rejected batches are final (409). Quality verdicts are re-derived from the results.
 * @param actor brewer or admin
 * @param id batch id (another co-op's → 404)
 * @param input validated batchUpdateSchema (volumes in the co-op's units, temperatures not here)
 */
export async function updateBatch(actor: Actor, id: number, input: BatchUpdateInput): Promise<BatchDto> {
  const units = actor.coop.units;
  await inTransaction(async (t) => {
    const row = await loadBatch(actor.coop.id, id, t, true);
    if (isFinal(row.status)) throw conflict(`Batch ${row.number} is ${row.status}; its record can no longer be changed.`);
    const planTouched = PLAN_FIELDS.filter((f) => input[f] !== undefined);
    if (planTouched.length && row.status !== 'planned') {
      throw new HttpError(409, 'The plan is fixed once the reaction has started.', Object.fromEntries(planTouched.map((f) => [f, ['The plan is fixed once the reaction has started.']])));
    }
    const changes: Record<string, unknown> = {};
    if (planTouched.length) {
      const base = planInputOf(row);
      const catalyst = input.catalyst ?? row.catalyst;
      const titration: PlanInput['titration'] = input.titrationTrials
        ? { source: 'trials', trials: input.titrationTrials, titrant: input.titrant ?? catalyst }
        : base.titration && (input.titrant || input.catalyst) && base.titration.source === 'trials'
          ? { ...base.titration, titrant: input.titrant ?? catalyst }
          : base.titration;
      // A titrant of the other chemical can't be the batch's stock: let the plan default it to pure reagent.
      const crossTitrant = titration !== null && titration.titrant !== undefined && titration.titrant !== catalyst;
      const plan = computePlan(
        {
          ...base, titration, catalyst,
          oilLiters: input.oilVolume !== undefined ? volumeToLiters(input.oilVolume, units) : base.oilLiters,
          titrationBlankMl: input.titrationBlankMl ?? base.titrationBlankMl,
          baseGramsPerLiter: input.baseGramsPerLiter ?? (input.catalyst && input.catalyst !== row.catalyst ? undefined : base.baseGramsPerLiter),
          purityPct: input.purityPct ?? (input.catalyst && input.catalyst !== row.catalyst ? undefined : base.purityPct),
          titrantFrom: input.titrantFrom ?? (crossTitrant ? undefined : row.titrantFrom),
          methanolMode: input.methanolMode ?? base.methanolMode,
          methanolPct: input.methanolPct ?? base.methanolPct,
          molarRatio: input.molarRatio ?? base.molarRatio,
          nextLotPurityPct: await nextLotPurity(actor.coop.id, catalyst, t),
        },
        actor.coop.settings.recipe,
        { system: units },
      );
      Object.assign(changes, planColumns(plan));
      if (input.batchDate) changes.batchDate = input.batchDate;
      if (input.oilLots) {
        await writeOilLots(actor, id, plan.oilLiters, input.oilLots.map((u) => ({ oilLotId: u.oilLotId, liters: volumeToLiters(u.volume, units) })), t);
      } else if (input.oilVolume !== undefined) {
        const lotsLiters = await BatchOilLot.sum('liters', { where: { batchId: id, coopId: actor.coop.id }, transaction: t });
        if (lotsLiters && Number(lotsLiters) > plan.oilLiters + 0.0005) throw fieldError({ oilVolume: ['The batch’s oil lots add up to more than this volume; change them too.'] });
      }
    }

    const vol = (v: number | null | undefined) => (v === undefined ? undefined : v === null ? null : volumeToLiters(v, units).toFixed(3));
    const set = (key: string, value: unknown) => {
      if (value !== undefined) changes[key] = value;
    };
    set('actualCatalystGrams', input.actualCatalystGrams === undefined ? undefined : input.actualCatalystGrams === null ? null : input.actualCatalystGrams.toFixed(3));
    set('actualMethanolLiters', vol(input.actualMethanol));
    set('mixingMinutes', input.mixingMinutes);
    set('settlingHours', input.settlingHours === undefined ? undefined : input.settlingHours === null ? null : input.settlingHours.toFixed(2));
    set('glycerinLiters', vol(input.glycerinDrained));
    set('washCycles', input.washCycles);
    set('washWaterLiters', vol(input.washWater));
    set('dryingMethod', input.dryingMethod);
    set('dryingNotes', input.dryingNotes);
    set('otherNotes', input.otherNotes);
    set('notes', input.notes);
    set('qualityStandard', input.qualityStandard);
    if (input.otherCost !== undefined) changes.otherCents = String(input.otherCost);
    if (input.feedstockCost !== undefined) changes.feedstockCentsOverride = input.feedstockCost === null ? null : String(input.feedstockCost);

    // Energy: metered kWh and heater kW × hours are alternatives; giving one clears the other.
    if (input.energyKwh !== undefined) {
      changes.energyKwh = input.energyKwh === null ? null : input.energyKwh.toFixed(3);
      if (input.energyKwh !== null) Object.assign(changes, { heaterKw: null, heaterHours: null });
    }
    if (input.heaterKw !== undefined || input.heaterHours !== undefined) {
      if (input.heaterKw !== undefined) changes.heaterKw = input.heaterKw === null ? null : input.heaterKw.toFixed(3);
      if (input.heaterHours !== undefined) changes.heaterHours = input.heaterHours === null ? null : input.heaterHours.toFixed(2);
      if (input.heaterKw != null || input.heaterHours != null) changes.energyKwh = null;
    }
    if (input.tariffCentsPerKwh !== undefined) changes.tariffCentsPerKwh = input.tariffCentsPerKwh === null ? null : input.tariffCentsPerKwh.toFixed(4);

    let quick = quickTestsOf(row);
    if (input.quickTests) {
      quick = { ...quick };
      for (const [k, v] of Object.entries(input.quickTests) as [keyof QuickTestsStored, unknown][]) {
        if (v === null) delete quick[k];
        else if (v !== undefined) (quick as Record<string, unknown>)[k] = v;
      }
      changes.quickTests = quick;
    }
    let lab: QualityResults = labResultsOf(row);
    if (input.labResults) {
      lab = { ...lab };
      for (const [k, v] of Object.entries(input.labResults) as [keyof QualityResults, QualityResults[keyof QualityResults]][]) {
        if (v === null) delete lab[k];
        else if (v !== undefined) lab[k] = v;
      }
      changes.labResults = lab;
    }
    const catalyst = (changes.catalyst as Catalyst | undefined) ?? row.catalyst;
    const standard = (changes.qualityStandard as FuelStandard | undefined) ?? row.qualityStandard;
    changes.qualityVerdict = evaluateQuality(standard, lab).overall;
    changes.screeningVerdict = evaluateQuickTests(quickTestInput(quick, catalyst)).overall;

    const before = Object.fromEntries(Object.keys(changes).map((k) => [k, row[k as keyof BatchRecord]]));
    await Batch.update(changes, { where: { id, coopId: actor.coop.id }, transaction: t });
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'batch.update', entityType: 'batch', entityId: id, before, after: changes }, t);
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}

/**
 * Moves a batch forward to a later working step (skipping is allowed, going back is not).
 * Final batches → 409. Starting the reaction sets the batch's date to today.
 */
export async function advanceBatch(actor: Actor, id: number, to: (typeof STEPS)[number]): Promise<BatchDto> {
  await inTransaction(async (t) => {
    const row = await loadBatch(actor.coop.id, id, t, true);
    if (isFinal(row.status)) throw conflict(`Batch ${row.number} is ${row.status}; its steps can no longer change.`);
    const from = STEPS.indexOf(row.status as (typeof STEPS)[number]);
    const target = STEPS.indexOf(to);
    if (target <= from) throw new HttpError(409, `A batch only moves forward: batch ${row.number} is already at “${row.status}”.`, { to: [`Choose a step after “${row.status}”.`] });
    const changes: Record<string, unknown> = { status: to, statusChangedAt: new Date() };
    if (row.status === 'planned') changes.batchDate = todayIn(actor.coop.timezone);
    await Batch.update(changes, { where: { id, coopId: actor.coop.id }, transaction: t });
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'batch.advance', entityType: 'batch', entityId: id, before: { status: row.status }, after: { status: to } }, t);
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}

/**
 * Adds a reaction temperature reading (typed in °F or °C by the co-op's units) and returns the
 * check lib/chemistry gives it — warnings show as readings are entered. Final batches → 409.
 */
export async function addTemperature(actor: Actor, id: number, input: { temp: number; measuredAt?: string }): Promise<TemperatureDto> {
  const tempC = tempToC(input.temp, actor.coop.units);
  if (!(tempC > -50 && tempC < 200)) throw fieldError({ temp: ['Check this reading: it is outside −50 … 200 °C.'] });
  const rounded = Math.round(tempC * 100) / 100;
  return inTransaction(async (t) => {
    const row = await loadBatch(actor.coop.id, id, t, true);
    if (isFinal(row.status)) throw conflict(`Batch ${row.number} is ${row.status}; its record can no longer be changed.`);
    const check = temperatureCheck(rounded, actor.coop.units, { elevationM: actor.coop.settings.elevationM ?? 0 });
    const reading = await BatchTemperature.create(
      { coopId: actor.coop.id, batchId: id, measuredAt: input.measuredAt ? new Date(input.measuredAt) : new Date(), tempC: rounded.toFixed(2), level: check.level, createdByUserId: actor.user.id },
      { transaction: t },
    );
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'batch.temperature', entityType: 'batch', entityId: id, after: { tempC: rounded, level: check.level } }, t);
    return { id: String(reading.id), measuredAt: reading.measuredAt.toISOString(), tempC: rounded, level: check.level, message: check.message };
  });
}
