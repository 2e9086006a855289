import 'server-only';
import { Op, type InferAttributes, type Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import { can, type Actor } from '@/lib/auth';
import { temperatureCheck, type TemperatureLevel } from '@/lib/chemistry';
import { energyCostCents } from '@/lib/costing';
import { conflict, HttpError, notFound } from '@/lib/http';
import { roundHalfUp } from '@/lib/money';
import { evaluateQuality, evaluateQuickTests, type FuelStandard, type QualityEvaluation, type QuickTestEvaluation, type QuickTestInput, type QualityResults } from '@/lib/quality';
import { getOilLot } from '@/lib/supplies';
import { checkLowStock } from '@/lib/supplies/low-stock';
import { litersToMl, mlToLiters } from '@/lib/tank/quantity';
import { tempToC, volumeToLiters } from '@/lib/units';
import type { BatchCreateInput, BatchUpdateInput } from '@/lib/validation/brewing';
import { inTransaction } from '@/lib/db';
import { Batch, BatchFile, BatchOilLot, BatchStatusCount, BatchTemperature, ChemicalConsumption, ChemicalLot, OilLot, Tank } from '@/models';
import type { BatchStatus } from '@/models/Batch';
import { lockBatchNumbers } from './queries';
import { computePlan, type Catalyst, type ComputedPlan, type PlanInput } from './plan';

/** The working steps in order; a batch only moves forward through them, then to released or rejected. */
export const STEPS = ['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;
export const FINAL: readonly BatchStatus[] = ['released', 'rejected'];
const isFinal = (s: string) => (FINAL as readonly string[]).includes(s);

const fieldError = (fields: Record<string, string[]>, message = 'Some fields need attention.') => new HttpError(422, message, fields);

/** A batch as stored (NUMERIC and BIGINT columns as strings). */
export type BatchRecord = InferAttributes<Batch>;

/** Quick tests as stored (the soap test's catalyst comes from the batch). */
export interface QuickTestsStored {
  test327?: { result: 'clear' | 'fallout'; falloutMl?: number };
  soap?: { hclMl: number; sampleGrams: number };
  washTest?: 'clean-split' | 'emulsion';
  water?: 'clear' | 'hazy';
}

const n = (v: string | number | null | undefined): number | null => (v === null || v === undefined ? null : Number(v));

/** Reads one batch of the co-op (404 otherwise), locked FOR UPDATE in the transaction when `lock` is set. */
export async function loadBatch(coopId: number, id: number, transaction?: Transaction, lock = false): Promise<BatchRecord> {
  if (!Number.isSafeInteger(id) || id <= 0) throw notFound('Batch not found.');
  const row = await Batch.findOne({
    where: { id, coopId }, raw: true, transaction, ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!row) throw notFound('Batch not found.');
  return row;
}

/** The quick tests and lab results of a batch in lib/quality's shapes (stored as JSONB). */
export const quickTestsOf = (row: Pick<BatchRecord, 'quickTests'>): QuickTestsStored => (row.quickTests ?? {}) as QuickTestsStored;
export const labResultsOf = (row: Pick<BatchRecord, 'labResults'>): QualityResults => (row.labResults ?? {}) as QualityResults;

/** The plan inputs a stored batch was computed from. */
export function planInputOf(row: BatchRecord): PlanInput {
  return {
    oilLiters: Number(row.oilLiters),
    titration: { source: row.titrationSource, trials: row.titrationTrialsMl.map(Number), titrant: row.titrant },
    titrationBlankMl: Number(row.titrationBlankMl),
    catalyst: row.catalyst,
    baseGramsPerLiter: Number(row.baseGPerL),
    purityPct: Number(row.purityPct),
    titrantFrom: row.titrantFrom,
    methanolMode: row.methanolMode,
    methanolPct: n(row.methanolPct) ?? undefined,
    molarRatio: n(row.molarRatio) ?? undefined,
  };
}

/** Quick tests in the shape lib/quality wants (the soap test takes the batch's catalyst). */
export function quickTestInput(stored: QuickTestsStored, catalyst: Catalyst): QuickTestInput {
  return {
    ...(stored.test327 ? { test327: stored.test327 } : {}),
    ...(stored.soap ? { soap: { ...stored.soap, catalyst } } : {}),
    ...(stored.washTest ? { washTest: stored.washTest } : {}),
    ...(stored.water ? { water: stored.water } : {}),
  };
}

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
  input: { titrationTrials?: number[]; oilLotId?: number },
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
  if (input.titrationTrials && input.titrationTrials.length > 0) return { titration: { source: 'trials', trials: input.titrationTrials }, lot };
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

/** Today's date (YYYY-MM-DD) in the co-op's time zone. */
export function todayIn(timezone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
}

const PLAN_FIELDS = ['oilVolume', 'titrationTrials', 'titrationBlankMl', 'catalyst', 'baseGramsPerLiter', 'purityPct', 'titrantFrom', 'methanolMode', 'methanolPct', 'molarRatio', 'oilLots', 'batchDate'] as const;

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
        ? { source: 'trials', trials: input.titrationTrials }
        : base.titration && input.catalyst && base.titration.source === 'trials'
          ? { ...base.titration, titrant: catalyst }
          : base.titration;
      const plan = computePlan(
        {
          ...base, titration, catalyst,
          oilLiters: input.oilVolume !== undefined ? volumeToLiters(input.oilVolume, units) : base.oilLiters,
          titrationBlankMl: input.titrationBlankMl ?? base.titrationBlankMl,
          baseGramsPerLiter: input.baseGramsPerLiter ?? (input.catalyst && input.catalyst !== row.catalyst ? undefined : base.baseGramsPerLiter),
          purityPct: input.purityPct ?? (input.catalyst && input.catalyst !== row.catalyst ? undefined : base.purityPct),
          titrantFrom: input.titrantFrom ?? base.titrantFrom,
          methanolMode: input.methanolMode ?? base.methanolMode,
          methanolPct: input.methanolPct ?? base.methanolPct,
          molarRatio: input.molarRatio ?? base.molarRatio,
          nextLotPurityPct: await nextLotPurity(actor.coop.id, catalyst, t),
        },
        actor.coop.settings.recipe,
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
      for (const [k, v] of Object.entries(input.labResults) as [keyof QualityResults, number | null | undefined][]) {
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

/** A temperature reading as returned: °C stored, with its level and message in the co-op's units. */
export interface TemperatureDto {
  id: string;
  measuredAt: string;
  tempC: number;
  level: TemperatureLevel;
  message: string;
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
    const check = temperatureCheck(rounded, actor.coop.units);
    const reading = await BatchTemperature.create(
      { coopId: actor.coop.id, batchId: id, measuredAt: input.measuredAt ? new Date(input.measuredAt) : new Date(), tempC: rounded.toFixed(2), level: check.level, createdByUserId: actor.user.id },
      { transaction: t },
    );
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'batch.temperature', entityType: 'batch', entityId: id, after: { tempC: rounded, level: check.level } }, t);
    return { id: String(reading.id), measuredAt: reading.measuredAt.toISOString(), tempC: rounded, level: check.level, message: check.message };
  });
}

// ---------------------------------------------------------------- reading

export interface BatchCosts {
  methanolCents: number;
  catalystCents: number;
  energyCents: number;
  feedstockCents: number;
  otherCents: number;
  totalCents: number;
  costPerGallonCents: number | null;
  costPerLiterCents: number | null;
}

/** Everything the batch page shows (brewers and admins). Volumes litres, temperatures °C, money cents. */
export interface BatchDto {
  view: 'full';
  id: number;
  number: number;
  status: BatchStatus;
  batchDate: string;
  statusChangedAt: string;
  createdAt: string;
  oilLiters: number;
  oilLots: { oilLotId: number; collectedFrom: string; collectedOn: string; liters: number; feedstockCents: number }[];
  plan: ComputedPlan;
  computedCatalystGrams: number;
  computedMethanolLiters: number;
  actualCatalystGrams: number | null;
  actualMethanolLiters: number | null;
  mixingMinutes: number | null;
  settlingHours: number | null;
  glycerinLiters: number | null;
  washCycles: number | null;
  washWaterLiters: number | null;
  dryingMethod: string | null;
  dryingNotes: string | null;
  temperatures: TemperatureDto[];
  quickTests: QuickTestsStored;
  quickTestEvaluation: QuickTestEvaluation;
  labResults: QualityResults;
  quality: QualityEvaluation;
  qualityVerdict: 'pass' | 'fail' | 'incomplete';
  screeningVerdict: 'looks-good' | 'needs-attention' | 'incomplete';
  energy: { kwh: number | null; heaterKw: number | null; heaterHours: number | null; tariffCentsPerKwh: number | null; costCents: number | null };
  feedstockCentsOverride: number | null;
  feedstockFromLotsCents: number;
  otherCents: number;
  otherNotes: string | null;
  release: { tankId: number; tankName: string | null; releasedLiters: number; releasedAt: string } | null;
  rejectedAt: string | null;
  rejectReason: string | null;
  costs: BatchCosts | null;
  consumptions: { chemicalLotId: number; kind: string; supplier: string; receivedOn: string; unit: 'L' | 'g'; quantity: number; costCents: number }[];
  files: { id: number; purpose: 'photo' | 'lab-report'; kind: 'pdf' | 'jpeg' | 'png'; name: string; sizeBytes: number; createdAt: string }[];
  notes: string | null;
}

/** What members and treasurers see of a released batch: its volume, dates and quality. */
export interface BatchSummaryDto {
  view: 'summary';
  id: number;
  number: number;
  status: BatchStatus;
  batchDate: string;
  oilLiters: number;
  catalyst: Catalyst;
  release: { releasedLiters: number; releasedAt: string; tankName: string | null } | null;
  costPerGallonCents: number | null;
  costPerLiterCents: number | null;
  quickTestEvaluation: QuickTestEvaluation;
  quality: QualityEvaluation;
  qualityVerdict: 'pass' | 'fail' | 'incomplete';
  screeningVerdict: 'looks-good' | 'needs-attention' | 'incomplete';
}

export function costsOf(row: Pick<BatchRecord, 'totalCostCents' | 'releasedLiters' | 'costMethanolCents' | 'costCatalystCents' | 'costEnergyCents' | 'costFeedstockCents' | 'costOtherCents' | 'costPerGallonCents'>): BatchCosts | null {
  if (row.totalCostCents === null) return null;
  const total = Number(row.totalCostCents);
  const liters = n(row.releasedLiters);
  return {
    methanolCents: Number(row.costMethanolCents ?? 0), catalystCents: Number(row.costCatalystCents ?? 0),
    energyCents: Number(row.costEnergyCents ?? 0), feedstockCents: Number(row.costFeedstockCents ?? 0),
    otherCents: Number(row.costOtherCents ?? 0), totalCents: total, costPerGallonCents: n(row.costPerGallonCents),
    costPerLiterCents: liters ? roundHalfUp(total / liters) : null,
  };
}

/** Energy cost of a batch from its stored inputs (0 without a tariff or without an amount). */
export function energyCentsOf(row: Pick<BatchRecord, 'energyKwh' | 'heaterKw' | 'heaterHours' | 'tariffCentsPerKwh'>): number | null {
  const tariff = n(row.tariffCentsPerKwh);
  if (tariff === null) return null;
  if (row.energyKwh !== null) return energyCostCents({ kwh: Number(row.energyKwh), tariffCentsPerKwh: tariff });
  if (row.heaterKw !== null && row.heaterHours !== null) {
    return energyCostCents({ heaterKw: Number(row.heaterKw), hours: Number(row.heaterHours), tariffCentsPerKwh: tariff });
  }
  return null;
}

/** Feedstock cost of each oil lot share: the lot's cost × litres used ÷ its volume, to the cent. */
export function feedstockShareCents(lotCostCents: number, usedLiters: string | number, lotVolumeLiters: string | number): number {
  const volumeMl = litersToMl(lotVolumeLiters);
  return volumeMl > 0 ? roundHalfUp((lotCostCents * litersToMl(usedLiters)) / volumeMl) : 0;
}

/** A batch's share of an oil lot, with the lot's details (its co-op matched too). */
export type BatchOilLotShare = Pick<InferAttributes<BatchOilLot>, 'oilLotId' | 'liters'> & {
  oilLot: Pick<InferAttributes<OilLot>, 'collectedFrom' | 'collectedOn' | 'costCents' | 'volumeLiters'>;
};

/** The oil lots a batch uses, oldest collection first, each with its lot (one query, the lot joined in). */
export async function batchOilLotShares(coopId: number, batchId: number, transaction?: Transaction): Promise<BatchOilLotShare[]> {
  return (await BatchOilLot.findAll({
    attributes: ['oilLotId', 'liters'],
    where: { batchId, coopId },
    include: [{ model: OilLot, as: 'oilLot', attributes: ['collectedFrom', 'collectedOn', 'costCents', 'volumeLiters'], where: { coopId }, required: true }],
    order: [[{ model: OilLot, as: 'oilLot' }, 'collectedOn', 'ASC'], [{ model: OilLot, as: 'oilLot' }, 'id', 'ASC']],
    raw: true, nest: true, transaction,
  })) as unknown as BatchOilLotShare[];
}

/** The name of a tank of the co-op (null when there is none). */
export async function tankName(coopId: number, tankId: number | null): Promise<string | null> {
  if (tankId === null) return null;
  const tank = await Tank.findOne({ attributes: ['name'], where: { id: tankId, coopId }, raw: true });
  return tank?.name ?? null;
}

type ConsumptionRow = Pick<InferAttributes<ChemicalConsumption>, 'chemicalLotId' | 'quantity' | 'costCents'> & {
  lot: Pick<InferAttributes<ChemicalLot>, 'kind' | 'supplier' | 'receivedOn' | 'quantityUnit'>;
};

/**
 * One batch of the actor's co-op. Brewers and admins get the full record; members and treasurers
 * get the quality summary of a released batch (any other batch is a 404 for them).
 */
export async function getBatch(actor: Actor, id: number): Promise<BatchDto>;
export async function getBatch(actor: Actor, id: number, opts: { allowSummary: true }): Promise<BatchDto | BatchSummaryDto>;
export async function getBatch(actor: Actor, id: number, opts?: { allowSummary: true }): Promise<BatchDto | BatchSummaryDto> {
  const full = can(actor.role, 'batches:read-all');
  const coopId = actor.coop.id;
  const row = await loadBatch(coopId, id);
  if (!full && (!opts?.allowSummary || row.status !== 'released')) throw notFound('Batch not found.');
  const quickTests = quickTestsOf(row);
  const labResults = labResultsOf(row);
  const quickTestEvaluation = evaluateQuickTests(quickTestInput(quickTests, row.catalyst));
  const quality = evaluateQuality(row.qualityStandard, labResults);
  if (!full) {
    const costs = costsOf(row);
    return {
      view: 'summary', id: row.id, number: row.number, status: row.status, batchDate: row.batchDate, oilLiters: Number(row.oilLiters),
      catalyst: row.catalyst, quickTestEvaluation, quality,
      costPerGallonCents: costs?.costPerGallonCents ?? null, costPerLiterCents: costs?.costPerLiterCents ?? null, qualityVerdict: row.qualityVerdict, screeningVerdict: row.screeningVerdict,
      release: row.releasedAt
        ? { releasedLiters: Number(row.releasedLiters), releasedAt: row.releasedAt.toISOString(), tankName: await tankName(coopId, row.tankId) }
        : null,
    };
  }
  const where = { batchId: id, coopId };
  const [tank, oilLots, temps, consumptions, files] = await Promise.all([
    tankName(coopId, row.tankId),
    batchOilLotShares(coopId, id),
    BatchTemperature.findAll({ attributes: ['id', 'measuredAt', 'tempC', 'level'], where, order: [['measuredAt', 'ASC'], ['id', 'ASC']], raw: true }),
    ChemicalConsumption.findAll({
      attributes: ['chemicalLotId', 'quantity', 'costCents'], where,
      include: [{ model: ChemicalLot, as: 'lot', attributes: ['kind', 'supplier', 'receivedOn', 'quantityUnit'], where: { coopId }, required: true }],
      order: [[{ model: ChemicalLot, as: 'lot' }, 'kind', 'ASC'], [{ model: ChemicalLot, as: 'lot' }, 'receivedOn', 'ASC'], [{ model: ChemicalLot, as: 'lot' }, 'id', 'ASC']],
      raw: true, nest: true,
    }) as unknown as Promise<ConsumptionRow[]>,
    BatchFile.findAll({ attributes: ['id', 'purpose', 'fileKind', 'originalName', 'sizeBytes', 'createdAt'], where, order: [['id', 'ASC']], raw: true }),
  ]);
  const oilLotDtos = oilLots.map((o) => ({
    oilLotId: o.oilLotId, collectedFrom: o.oilLot.collectedFrom, collectedOn: o.oilLot.collectedOn, liters: Number(o.liters),
    feedstockCents: feedstockShareCents(Number(o.oilLot.costCents), o.liters, o.oilLot.volumeLiters),
  }));
  return {
    view: 'full', id: row.id, number: row.number, status: row.status, batchDate: row.batchDate,
    statusChangedAt: new Date(row.statusChangedAt).toISOString(), createdAt: new Date(row.createdAt).toISOString(),
    oilLiters: Number(row.oilLiters), oilLots: oilLotDtos, plan: computePlan(planInputOf(row)),
    computedCatalystGrams: Number(row.computedCatalystGrams), computedMethanolLiters: Number(row.computedMethanolLiters),
    actualCatalystGrams: n(row.actualCatalystGrams), actualMethanolLiters: n(row.actualMethanolLiters),
    mixingMinutes: row.mixingMinutes, settlingHours: n(row.settlingHours), glycerinLiters: n(row.glycerinLiters),
    washCycles: row.washCycles, washWaterLiters: n(row.washWaterLiters), dryingMethod: row.dryingMethod, dryingNotes: row.dryingNotes,
    temperatures: temps.map((r) => {
      const tempC = Number(r.tempC);
      return { id: String(r.id), measuredAt: new Date(r.measuredAt).toISOString(), tempC, level: r.level, message: temperatureCheck(tempC, actor.coop.units).message };
    }),
    quickTests, quickTestEvaluation, labResults, quality,
    qualityVerdict: row.qualityVerdict, screeningVerdict: row.screeningVerdict,
    energy: {
      kwh: n(row.energyKwh), heaterKw: n(row.heaterKw), heaterHours: n(row.heaterHours), tariffCentsPerKwh: n(row.tariffCentsPerKwh),
      costCents: energyCentsOf(row),
    },
    feedstockCentsOverride: n(row.feedstockCentsOverride),
    feedstockFromLotsCents: oilLotDtos.reduce((a, o) => a + o.feedstockCents, 0),
    otherCents: Number(row.otherCents), otherNotes: row.otherNotes,
    release: row.releasedAt && row.tankId
      ? { tankId: row.tankId, tankName: tank, releasedLiters: Number(row.releasedLiters), releasedAt: row.releasedAt.toISOString() }
      : null,
    rejectedAt: row.rejectedAt ? row.rejectedAt.toISOString() : null, rejectReason: row.rejectReason,
    costs: costsOf(row),
    consumptions: consumptions.map((c) => ({
      chemicalLotId: c.chemicalLotId, kind: c.lot.kind, supplier: c.lot.supplier, receivedOn: c.lot.receivedOn, unit: c.lot.quantityUnit,
      quantity: Number(c.quantity), costCents: Number(c.costCents),
    })),
    files: files.map((f) => ({ id: f.id, purpose: f.purpose, kind: f.fileKind, name: f.originalName, sizeBytes: f.sizeBytes, createdAt: new Date(f.createdAt).toISOString() })),
    notes: row.notes,
  };
}

/** One row of the batch list. */
export interface BatchListRow {
  id: number;
  number: number;
  status: BatchStatus;
  batchDate: string;
  oilLiters: number;
  releasedLiters: number | null;
  costPerGallonCents: number | null;
  costPerLiterCents: number | null;
  qualityStandard: FuelStandard;
  qualityVerdict: 'pass' | 'fail' | 'incomplete';
  screeningVerdict: 'looks-good' | 'needs-attention' | 'incomplete';
}

/** Sort keys of the list → columns; every sort ends on the batch number (unique per co-op). */
const LIST_SORT: Record<string, keyof BatchRecord> = {
  number: 'number', date: 'batchDate', status: 'status', volume: 'releasedLiters', costPerGallon: 'costPerGallonCents',
};
const LIST_ATTRIBUTES = [
  'id', 'number', 'status', 'batchDate', 'oilLiters', 'releasedLiters', 'totalCostCents', 'costPerGallonCents',
  'qualityStandard', 'qualityVerdict', 'screeningVerdict',
] as const satisfies readonly (keyof BatchRecord)[];
const IN_PROGRESS: BatchStatus[] = ['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'];

type BatchListQuery = { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; status?: string };
type BatchListPage = { rows: BatchListRow[]; total: number; page: number; pageSize: number };

/**
 * A page of the co-op's batches, sorted and filtered in SQL (an index on (coop_id, number) or
 * (coop_id, batch_date, number) gives the order), with the total from the per-status counts the
 * batches' triggers keep (a few rows instead of counting the co-op's batches on every page); both
 * read in parallel. Members and treasurers see released batches only.
 */
export async function listBatches(actor: Actor, q: BatchListQuery): Promise<BatchListPage> {
  const all = can(actor.role, 'batches:read-all');
  if (!all && q.status && q.status !== 'released') return { rows: [], total: 0, page: q.page, pageSize: q.pageSize };
  const statuses = !all ? ['released'] : q.status === 'in-progress' ? IN_PROGRESS : q.status ? [q.status] : null;
  const where = statuses ? { coopId: actor.coop.id, status: statuses } : { coopId: actor.coop.id };
  const key = LIST_SORT[q.sort] ?? 'number';
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  // NOT NULL sort columns need no NULLS LAST, so the indexes give the order; volume and cost may be null.
  const order: [string, string][] =
    key === 'number' ? [['number', dir]]
      : key === 'batchDate' || key === 'status' ? [[key, dir], ['number', dir]]
        : [[key, `${dir} NULLS LAST`], ['number', dir]];
  const [rows, total] = await Promise.all([
    Batch.findAll({ attributes: [...LIST_ATTRIBUTES], where, order, limit: q.pageSize, offset: (q.page - 1) * q.pageSize, raw: true }),
    BatchStatusCount.sum('n', { where }),
  ]);
  return {
    rows: rows.map((r) => {
      const releasedLiters = n(r.releasedLiters);
      return {
        id: r.id, number: r.number, status: r.status, batchDate: r.batchDate, oilLiters: Number(r.oilLiters), releasedLiters,
        costPerGallonCents: n(r.costPerGallonCents),
        costPerLiterCents: r.totalCostCents !== null && releasedLiters ? roundHalfUp(Number(r.totalCostCents) / releasedLiters) : null,
        qualityStandard: r.qualityStandard, qualityVerdict: r.qualityVerdict, screeningVerdict: r.screeningVerdict,
      };
    }),
    total: Number(total ?? 0), page: q.page, pageSize: q.pageSize,
  };
}
