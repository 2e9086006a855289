import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
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
import { Batch, BatchOilLot, BatchTemperature, sequelize } from '@/models';
import { runReadPlan, statement, type ReadPlan, type Statement } from '@/lib/db';
import type { BatchStatus } from '@/models/Batch';
import { computePlan, type Catalyst, type ComputedPlan, type PlanInput } from './plan';

/** The working steps in order; a batch only moves forward through them, then to released or rejected. */
export const STEPS = ['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;
export const FINAL: readonly BatchStatus[] = ['released', 'rejected'];
const isFinal = (s: string) => (FINAL as readonly string[]).includes(s);

const fieldError = (fields: Record<string, string[]>, message = 'Some fields need attention.') => new HttpError(422, message, fields);

/** A row of the batches table as PostgreSQL returns it (NUMERIC/BIGINT as strings). */
export interface BatchRow {
  id: number; coop_id: number; number: number; status: BatchStatus; batch_date: string; status_changed_at: Date; created_at: Date;
  oil_liters: string; titration_trials_ml: number[]; titration_blank_ml: string; titration_source: 'trials' | 'oil-lot'; titrant: Catalyst;
  titration_avg_ml: string; catalyst: Catalyst; base_g_per_l: string; purity_pct: string; titrant_from: 'same-catalyst' | 'pure-reagent';
  catalyst_rule: string; methanol_mode: 'percent' | 'molar-ratio'; methanol_pct: string | null; molar_ratio: string | null;
  computed_catalyst_grams: string; computed_methanol_liters: string; actual_catalyst_grams: string | null; actual_methanol_liters: string | null;
  mixing_minutes: number | null; settling_hours: string | null; glycerin_liters: string | null; wash_cycles: number | null;
  wash_water_liters: string | null; drying_method: string | null; drying_notes: string | null; quick_tests: QuickTestsStored;
  lab_results: QualityResults; quality_standard: FuelStandard; quality_verdict: 'pass' | 'fail' | 'incomplete';
  screening_verdict: 'looks-good' | 'needs-attention' | 'incomplete'; energy_kwh: string | null; heater_kw: string | null;
  heater_hours: string | null; tariff_cents_per_kwh: string | null; feedstock_cents_override: string | null; other_cents: string;
  other_notes: string | null; tank_id: number | null; released_liters: string | null; released_at: Date | null; rejected_at: Date | null;
  reject_reason: string | null; cost_methanol_cents: string | null; cost_catalyst_cents: string | null; cost_energy_cents: string | null;
  cost_feedstock_cents: string | null; cost_other_cents: string | null; total_cost_cents: string | null; cost_per_gallon_cents: string | null;
  notes: string | null;
}

/** Quick tests as stored (the soap test's catalyst comes from the batch). */
export interface QuickTestsStored {
  test327?: { result: 'clear' | 'fallout'; falloutMl?: number };
  soap?: { hclMl: number; sampleGrams: number };
  washTest?: 'clean-split' | 'emulsion';
  water?: 'clear' | 'hazy';
}

const n = (v: string | number | null | undefined): number | null => (v === null || v === undefined ? null : Number(v));

/** Reads one batch of the co-op (404 otherwise), optionally locking it for the transaction. */
export async function loadBatchRow(coopId: number, id: number, transaction?: Transaction, lock = false): Promise<BatchRow> {
  if (!Number.isSafeInteger(id) || id <= 0) throw notFound('Batch not found.');
  const [row] = await sequelize.query<BatchRow>(`SELECT * FROM batches WHERE id = :id AND coop_id = :coopId${lock ? ' FOR UPDATE' : ''}`, {
    replacements: { id, coopId }, type: QueryTypes.SELECT, transaction,
  });
  if (!row) throw notFound('Batch not found.');
  return row;
}

/** The plan inputs a stored batch was computed from. */
function planInputOf(row: BatchRow): PlanInput {
  return {
    oilLiters: Number(row.oil_liters),
    titration: { source: row.titration_source, trials: row.titration_trials_ml.map(Number), titrant: row.titrant },
    titrationBlankMl: Number(row.titration_blank_ml),
    catalyst: row.catalyst,
    baseGramsPerLiter: Number(row.base_g_per_l),
    purityPct: Number(row.purity_pct),
    titrantFrom: row.titrant_from,
    methanolMode: row.methanol_mode,
    methanolPct: n(row.methanol_pct) ?? undefined,
    molarRatio: n(row.molar_ratio) ?? undefined,
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
  const [row] = await sequelize.query<{ purity_pct: string }>(
    `SELECT purity_pct FROM chemical_lots WHERE coop_id = :coopId AND kind = :catalyst AND remaining_quantity > 0 ORDER BY received_on, id LIMIT 1`,
    { replacements: { coopId, catalyst }, type: QueryTypes.SELECT, transaction },
  );
  return row ? Number(row.purity_pct) : null;
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
    const [mine] = await sequelize.query<{ liters: string }>(
      `SELECT liters FROM batch_oil_lots WHERE batch_id = :batchId AND oil_lot_id = :lotId AND coop_id = :coopId`,
      { replacements: { batchId, lotId: lot.id, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction: t },
    );
    const freeMl = litersToMl(lot.remainingLiters) + (mine ? litersToMl(mine.liters) : 0);
    const useMl = litersToMl(use.liters.toFixed(3));
    if (useMl > freeMl) {
      throw fieldError({ [`oilLots.${i}.volume`]: [`The lot from ${lot.collectedFrom} has only ${mlToLiters(freeMl)} L left.`] });
    }
    totalMl += useMl;
  }
  if (totalMl > litersToMl(oilLiters.toFixed(3))) throw fieldError({ oilLots: ['The oil lots add up to more than the batch’s oil volume.'] });
  await sequelize.query(`DELETE FROM batch_oil_lots WHERE batch_id = :batchId AND coop_id = :coopId`, {
    replacements: { batchId, coopId: actor.coop.id }, transaction: t,
  });
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
  const id = await sequelize.transaction(async (t) => {
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

    await sequelize.query(`SELECT pg_advisory_xact_lock(7301, :coopId)`, { replacements: { coopId: actor.coop.id }, transaction: t });
    const [next] = await sequelize.query<{ n: number }>(`SELECT COALESCE(max(number), 0) + 1 AS n FROM batches WHERE coop_id = :coopId`, {
      replacements: { coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction: t,
    });
    const batch = await Batch.create(
      {
        coopId: actor.coop.id, number: Number(next!.n), ...planColumns(plan), batchDate: input.batchDate ?? todayIn(actor.coop.timezone),
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
  await sequelize.transaction(async (t) => {
    const row = await loadBatchRow(actor.coop.id, id, t, true);
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
        const [sum] = await sequelize.query<{ l: string | null }>(`SELECT sum(liters) AS l FROM batch_oil_lots WHERE batch_id = :id AND coop_id = :coopId`, {
          replacements: { id, coopId: actor.coop.id }, type: QueryTypes.SELECT, transaction: t,
        });
        if (sum?.l && Number(sum.l) > plan.oilLiters + 0.0005) throw fieldError({ oilVolume: ['The batch’s oil lots add up to more than this volume; change them too.'] });
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

    let quick = row.quick_tests ?? {};
    if (input.quickTests) {
      quick = { ...quick };
      for (const [k, v] of Object.entries(input.quickTests) as [keyof QuickTestsStored, unknown][]) {
        if (v === null) delete quick[k];
        else if (v !== undefined) (quick as Record<string, unknown>)[k] = v;
      }
      changes.quickTests = quick;
    }
    let lab: QualityResults = row.lab_results ?? {};
    if (input.labResults) {
      lab = { ...lab };
      for (const [k, v] of Object.entries(input.labResults) as [keyof QualityResults, number | null | undefined][]) {
        if (v === null) delete lab[k];
        else if (v !== undefined) lab[k] = v;
      }
      changes.labResults = lab;
    }
    const catalyst = (changes.catalyst as Catalyst | undefined) ?? row.catalyst;
    const standard = (changes.qualityStandard as FuelStandard | undefined) ?? row.quality_standard;
    changes.qualityVerdict = evaluateQuality(standard, lab).overall;
    changes.screeningVerdict = evaluateQuickTests(quickTestInput(quick, catalyst)).overall;

    const before = pickColumns(row, Object.keys(changes));
    await Batch.update(changes, { where: { id, coopId: actor.coop.id }, transaction: t });
    await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'batch.update', entityType: 'batch', entityId: id, before, after: changes }, t);
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}

/** The stored values of the columns named in camelCase, for the audit's "before". */
function pickColumns(row: BatchRow, keys: string[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of keys) {
    const col = k === 'baseGPerL' ? 'base_g_per_l' : k.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
    out[k] = (row as unknown as Record<string, unknown>)[col];
  }
  return out;
}

/**
 * Moves a batch forward to a later working step (skipping is allowed, going back is not).
 * Final batches → 409. Starting the reaction sets the batch's date to today.
 */
export async function advanceBatch(actor: Actor, id: number, to: (typeof STEPS)[number]): Promise<BatchDto> {
  await sequelize.transaction(async (t) => {
    const row = await loadBatchRow(actor.coop.id, id, t, true);
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
  return sequelize.transaction(async (t) => {
    const row = await loadBatchRow(actor.coop.id, id, t, true);
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

export function costsOf(row: BatchRow): BatchCosts | null {
  if (row.total_cost_cents === null) return null;
  const total = Number(row.total_cost_cents);
  const liters = n(row.released_liters);
  return {
    methanolCents: Number(row.cost_methanol_cents ?? 0), catalystCents: Number(row.cost_catalyst_cents ?? 0),
    energyCents: Number(row.cost_energy_cents ?? 0), feedstockCents: Number(row.cost_feedstock_cents ?? 0),
    otherCents: Number(row.cost_other_cents ?? 0), totalCents: total, costPerGallonCents: n(row.cost_per_gallon_cents),
    costPerLiterCents: liters ? roundHalfUp(total / liters) : null,
  };
}

/** Energy cost of a batch from its stored inputs (0 without a tariff or without an amount). */
export function energyCentsOf(row: Pick<BatchRow, 'energy_kwh' | 'heater_kw' | 'heater_hours' | 'tariff_cents_per_kwh'>): number | null {
  const tariff = n(row.tariff_cents_per_kwh);
  if (tariff === null) return null;
  if (row.energy_kwh !== null) return energyCostCents({ kwh: Number(row.energy_kwh), tariffCentsPerKwh: tariff });
  if (row.heater_kw !== null && row.heater_hours !== null) {
    return energyCostCents({ heaterKw: Number(row.heater_kw), hours: Number(row.heater_hours), tariffCentsPerKwh: tariff });
  }
  return null;
}

/** Feedstock cost of each oil lot share: the lot's cost × litres used ÷ its volume, to the cent. */
export function feedstockShareCents(lotCostCents: number, usedLiters: string | number, lotVolumeLiters: string | number): number {
  const volumeMl = litersToMl(lotVolumeLiters);
  return volumeMl > 0 ? roundHalfUp((lotCostCents * litersToMl(usedLiters)) / volumeMl) : 0;
}

/**
 * One batch of the actor's co-op. Brewers and admins get the full record; members and treasurers
 * get the quality summary of a released batch (any other batch is a 404 for them).
 */
export async function getBatch(actor: Actor, id: number): Promise<BatchDto>;
export async function getBatch(actor: Actor, id: number, opts: { allowSummary: true }): Promise<BatchDto | BatchSummaryDto>;
export async function getBatch(actor: Actor, id: number, opts?: { allowSummary: true }): Promise<BatchDto | BatchSummaryDto> {
  const full = can(actor.role, 'batches:read-all');
  const row = await loadBatchRow(actor.coop.id, id);
  if (!full && (!opts?.allowSummary || row.status !== 'released')) throw notFound('Batch not found.');
  const [tank] = row.tank_id
    ? await sequelize.query<{ name: string }>(`SELECT name FROM tanks WHERE id = :id AND coop_id = :coopId`, {
      replacements: { id: row.tank_id, coopId: actor.coop.id }, type: QueryTypes.SELECT,
    })
    : [];
  const quickTestEvaluation = evaluateQuickTests(quickTestInput(row.quick_tests ?? {}, row.catalyst));
  const quality = evaluateQuality(row.quality_standard, row.lab_results ?? {});
  if (!full) {
    return {
      view: 'summary', id: row.id, number: row.number, status: row.status, batchDate: row.batch_date, oilLiters: Number(row.oil_liters),
      catalyst: row.catalyst, quickTestEvaluation, quality,
      costPerGallonCents: costsOf(row)?.costPerGallonCents ?? null, costPerLiterCents: costsOf(row)?.costPerLiterCents ?? null, qualityVerdict: row.quality_verdict, screeningVerdict: row.screening_verdict,
      release: row.released_at ? { releasedLiters: Number(row.released_liters), releasedAt: row.released_at.toISOString(), tankName: tank?.name ?? null } : null,
    };
  }
  const replacements = { id, coopId: actor.coop.id };
  const [oilLots, temps, consumptions, files] = await Promise.all([
    sequelize.query<{ oil_lot_id: number; collected_from: string; collected_on: string; liters: string; cost_cents: string; volume_liters: string }>(
      `SELECT bol.oil_lot_id, o.collected_from, o.collected_on, bol.liters, o.cost_cents, o.volume_liters FROM batch_oil_lots bol
         JOIN oil_lots o ON o.id = bol.oil_lot_id AND o.coop_id = bol.coop_id
        WHERE bol.batch_id = :id AND bol.coop_id = :coopId ORDER BY o.collected_on, o.id`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ id: string; measured_at: Date; temp_c: string; level: TemperatureLevel }>(
      `SELECT id, measured_at, temp_c, level FROM batch_temperatures WHERE batch_id = :id AND coop_id = :coopId ORDER BY measured_at, id`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ chemical_lot_id: number; kind: string; supplier: string; received_on: string; quantity_unit: 'L' | 'g'; quantity: string; cost_cents: string }>(
      `SELECT cc.chemical_lot_id, l.kind, l.supplier, l.received_on, l.quantity_unit, cc.quantity, cc.cost_cents FROM chemical_consumptions cc
         JOIN chemical_lots l ON l.id = cc.chemical_lot_id AND l.coop_id = cc.coop_id
        WHERE cc.batch_id = :id AND cc.coop_id = :coopId ORDER BY l.kind, l.received_on, l.id`,
      { replacements, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ id: number; purpose: 'photo' | 'lab-report'; file_kind: 'pdf' | 'jpeg' | 'png'; original_name: string; size_bytes: number; created_at: Date }>(
      `SELECT id, purpose, file_kind, original_name, size_bytes, created_at FROM batch_files WHERE batch_id = :id AND coop_id = :coopId ORDER BY id`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  const oilLotDtos = oilLots.map((o) => ({
    oilLotId: o.oil_lot_id, collectedFrom: o.collected_from, collectedOn: o.collected_on, liters: Number(o.liters),
    feedstockCents: feedstockShareCents(Number(o.cost_cents), o.liters, o.volume_liters),
  }));
  return {
    view: 'full', id: row.id, number: row.number, status: row.status, batchDate: row.batch_date,
    statusChangedAt: new Date(row.status_changed_at).toISOString(), createdAt: new Date(row.created_at).toISOString(),
    oilLiters: Number(row.oil_liters), oilLots: oilLotDtos, plan: computePlan(planInputOf(row)),
    computedCatalystGrams: Number(row.computed_catalyst_grams), computedMethanolLiters: Number(row.computed_methanol_liters),
    actualCatalystGrams: n(row.actual_catalyst_grams), actualMethanolLiters: n(row.actual_methanol_liters),
    mixingMinutes: row.mixing_minutes, settlingHours: n(row.settling_hours), glycerinLiters: n(row.glycerin_liters),
    washCycles: row.wash_cycles, washWaterLiters: n(row.wash_water_liters), dryingMethod: row.drying_method, dryingNotes: row.drying_notes,
    temperatures: temps.map((r) => {
      const tempC = Number(r.temp_c);
      return { id: String(r.id), measuredAt: new Date(r.measured_at).toISOString(), tempC, level: r.level, message: temperatureCheck(tempC, actor.coop.units).message };
    }),
    quickTests: row.quick_tests ?? {}, quickTestEvaluation, labResults: row.lab_results ?? {}, quality,
    qualityVerdict: row.quality_verdict, screeningVerdict: row.screening_verdict,
    energy: {
      kwh: n(row.energy_kwh), heaterKw: n(row.heater_kw), heaterHours: n(row.heater_hours), tariffCentsPerKwh: n(row.tariff_cents_per_kwh),
      costCents: energyCentsOf(row),
    },
    feedstockCentsOverride: n(row.feedstock_cents_override),
    feedstockFromLotsCents: oilLotDtos.reduce((a, o) => a + o.feedstockCents, 0),
    otherCents: Number(row.other_cents), otherNotes: row.other_notes,
    release: row.released_at && row.tank_id
      ? { tankId: row.tank_id, tankName: tank?.name ?? null, releasedLiters: Number(row.released_liters), releasedAt: row.released_at.toISOString() }
      : null,
    rejectedAt: row.rejected_at ? row.rejected_at.toISOString() : null, rejectReason: row.reject_reason,
    costs: costsOf(row),
    consumptions: consumptions.map((c) => ({
      chemicalLotId: c.chemical_lot_id, kind: c.kind, supplier: c.supplier, receivedOn: c.received_on, unit: c.quantity_unit,
      quantity: Number(c.quantity), costCents: Number(c.cost_cents),
    })),
    files: files.map((f) => ({ id: f.id, purpose: f.purpose, kind: f.file_kind, name: f.original_name, sizeBytes: f.size_bytes, createdAt: new Date(f.created_at).toISOString() })),
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

const LIST_SORT: Record<string, string> = {
  number: 'number', date: 'batch_date', status: 'status', volume: 'released_liters', costPerGallon: 'cost_per_gallon_cents',
};
const LIST_COLUMNS = `id, number, status, batch_date, oil_liters, released_liters, total_cost_cents, cost_per_gallon_cents,
  quality_standard, quality_verdict, screening_verdict`;
/** The list's statements, one per sort and filter shape (at most 20), declared on first use. */
const LIST_STATEMENTS = new Map<string, Statement>();
const IN_PROGRESS = ['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'];

type BatchListQuery = { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; status?: string };
type BatchListPage = { rows: BatchListRow[]; total: number; page: number; pageSize: number };
/** One batch of the page as PostgreSQL builds it (numbers as JSON numbers, the date as 'YYYY-MM-DD'). */
type BatchListJson = [
  id: number, number: number, status: BatchStatus, batchDate: string, oilLiters: number, releasedLiters: number | null,
  totalCostCents: number | null, costPerGallonCents: number | null, qualityStandard: FuelStandard,
  qualityVerdict: 'pass' | 'fail' | 'incomplete', screeningVerdict: 'looks-good' | 'needs-attention' | 'incomplete',
];

/**
 * A page of the co-op's batches, sorted and filtered in SQL (one query, indexed by co-op), as a
 * plan the batch list route sends together with the session check.
 * Members and treasurers see released batches only.
 */
export function batchListPlan(actor: Actor, q: BatchListQuery): ReadPlan<BatchListPage> {
  const col = LIST_SORT[q.sort] ?? 'number';
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const all = can(actor.role, 'batches:read-all');
  if (!all && q.status && q.status !== 'released') return { reads: [], finish: () => ({ rows: [], total: 0, page: q.page, pageSize: q.pageSize }) };
  const statuses = !all ? ['released'] : q.status === 'in-progress' ? IN_PROGRESS : q.status ? [q.status] : null;
  // NOT NULL sort columns need no NULLS LAST, so the (coop_id, number) and (coop_id, batch_date, number) indexes give the order.
  const order = col === 'number' ? `number ${dir}` : col === 'batch_date' || col === 'status' ? `${col} ${dir}, number ${dir}` : `${col} ${dir} NULLS LAST, number ${dir}`;
  const where = `coop_id = $1 ${statuses ? 'AND status = ANY($2)' : ''}`;
  const values: unknown[] = statuses ? [actor.coop.id, statuses] : [actor.coop.id];
  const n0 = values.length;
  // The page by an index on (coop_id, number) or (coop_id, batch_date, number), and the total from the per-status
  // counts the batches' triggers keep (a few rows, instead of counting the co-op's batches on every page). The
  // page comes back as one JSON array (one value to parse instead of eleven columns per batch), and the one
  // row always carries the total, also for a page past the end.
  const name = `tv_batch_list_${col}_${dir.toLowerCase()}_${statuses ? 'by_status' : 'all'}`;
  let page = LIST_STATEMENTS.get(name);
  if (!page) {
    page = statement(
      `SELECT (SELECT coalesce(sum(n), 0) FROM batch_status_counts WHERE ${where}) AS total,
              (SELECT coalesce(json_agg(json_build_array(${LIST_COLUMNS}) ORDER BY ${order}), '[]')
                 FROM (SELECT ${LIST_COLUMNS} FROM batches WHERE ${where} ORDER BY ${order} LIMIT $${n0 + 1} OFFSET $${n0 + 2}) b) AS rows`,
      name,
    );
    LIST_STATEMENTS.set(name, page);
  }
  return {
    reads: [[page, [...values, q.pageSize, (q.page - 1) * q.pageSize]]],
    finish: ([found]) => {
      const [{ total, rows }] = found as [{ total: string; rows: BatchListJson[] }];
      return {
        rows: rows.map(([id, number, status, batchDate, oilLiters, releasedLiters, totalCostCents, costPerGallonCents, qualityStandard, qualityVerdict, screeningVerdict]) => ({
          id, number, status, batchDate, oilLiters, releasedLiters, costPerGallonCents,
          costPerLiterCents: totalCostCents !== null && releasedLiters ? roundHalfUp(totalCostCents / releasedLiters) : null,
          qualityStandard, qualityVerdict, screeningVerdict,
        })),
        total: Number(total), page: q.page, pageSize: q.pageSize,
      };
    },
  };
}

/** A page of the co-op's batches (see {@link batchListPlan}). */
export function listBatches(actor: Actor, q: BatchListQuery): Promise<BatchListPage> {
  return runReadPlan(batchListPlan(actor, q));
}
