import 'server-only';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { conflict, HttpError } from '@/lib/http';
import { evaluateQuality, evaluateQuickTests, type FuelStandard, type QualityResults } from '@/lib/quality';
import { checkLowStock } from '@/lib/supplies/low-stock';
import { volumeToLiters } from '@/lib/units';
import type { BatchUpdateInput } from '@/lib/validation/brewing';
import { inTransaction } from '@/lib/db';
import { Batch, BatchOilLot } from '@/models';
import { computePlan, type Catalyst, type PlanInput } from './plan';
import { fieldError, nextLotPurity, planColumns, writeOilLots } from './plan-inputs';
import { getBatch, type BatchDto } from './read';
import {
  labResultsOf,
  loadBrewedBatch,
  planInputOf,
  quickTestInput,
  quickTestsOf,
  type BatchRecord,
  type QuickTestsStored,
} from './stored';
import { isFinal } from './records';

// Recording what was done at a batch's steps, its costs and test results, and changing its plan while planned.

const PLAN_FIELDS = [
  'oilVolume',
  'titrationTrials',
  'titrationBlankMl',
  'catalyst',
  'baseGramsPerLiter',
  'purityPct',
  'titrantFrom',
  'titrant',
  'methanolMode',
  'methanolPct',
  'molarRatio',
  'oilLots',
  'batchDate',
] as const;

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
    const row = await loadBrewedBatch(actor.coop.id, id, t, true);
    if (isFinal(row.status))
      throw conflict(`Batch ${row.number} is ${row.status}; its record can no longer be changed.`);
    const planTouched = PLAN_FIELDS.filter((f) => input[f] !== undefined);
    if (planTouched.length && row.status !== 'planned') {
      throw new HttpError(
        409,
        'The plan is fixed once the reaction has started.',
        Object.fromEntries(planTouched.map((f) => [f, ['The plan is fixed once the reaction has started.']])),
      );
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
          ...base,
          titration,
          catalyst,
          oilLiters: input.oilVolume !== undefined ? volumeToLiters(input.oilVolume, units) : base.oilLiters,
          titrationBlankMl: input.titrationBlankMl ?? base.titrationBlankMl,
          baseGramsPerLiter:
            input.baseGramsPerLiter ??
            (input.catalyst && input.catalyst !== row.catalyst ? undefined : base.baseGramsPerLiter),
          purityPct:
            input.purityPct ?? (input.catalyst && input.catalyst !== row.catalyst ? undefined : base.purityPct),
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
        await writeOilLots(
          actor,
          id,
          plan.oilLiters,
          input.oilLots.map((u) => ({ oilLotId: u.oilLotId, liters: volumeToLiters(u.volume, units) })),
          t,
        );
      } else if (input.oilVolume !== undefined) {
        const lotsLiters = await BatchOilLot.sum('liters', {
          where: { batchId: id, coopId: actor.coop.id },
          transaction: t,
        });
        if (lotsLiters && Number(lotsLiters) > plan.oilLiters + 0.0005)
          throw fieldError({ oilVolume: ['The batch’s oil lots add up to more than this volume; change them too.'] });
      }
    }

    const vol = (v: number | null | undefined) =>
      v === undefined ? undefined : v === null ? null : volumeToLiters(v, units).toFixed(3);
    const set = (key: string, value: unknown) => {
      if (value !== undefined) changes[key] = value;
    };
    set(
      'actualCatalystGrams',
      input.actualCatalystGrams === undefined
        ? undefined
        : input.actualCatalystGrams === null
          ? null
          : input.actualCatalystGrams.toFixed(3),
    );
    set('actualMethanolLiters', vol(input.actualMethanol));
    set('mixingMinutes', input.mixingMinutes);
    set(
      'settlingHours',
      input.settlingHours === undefined
        ? undefined
        : input.settlingHours === null
          ? null
          : input.settlingHours.toFixed(2),
    );
    set('glycerinLiters', vol(input.glycerinDrained));
    set('washCycles', input.washCycles);
    set('washWaterLiters', vol(input.washWater));
    set('dryingMethod', input.dryingMethod);
    set('dryingNotes', input.dryingNotes);
    set('otherNotes', input.otherNotes);
    set('notes', input.notes);
    set('qualityStandard', input.qualityStandard);
    if (input.otherCost !== undefined) changes.otherCents = String(input.otherCost);
    if (input.feedstockCost !== undefined)
      changes.feedstockCentsOverride = input.feedstockCost === null ? null : String(input.feedstockCost);

    // Energy: metered kWh and heater kW × hours are alternatives; giving one clears the other.
    if (input.energyKwh !== undefined) {
      changes.energyKwh = input.energyKwh === null ? null : input.energyKwh.toFixed(3);
      if (input.energyKwh !== null) Object.assign(changes, { heaterKw: null, heaterHours: null });
    }
    if (input.heaterKw !== undefined || input.heaterHours !== undefined) {
      if (input.heaterKw !== undefined) changes.heaterKw = input.heaterKw === null ? null : input.heaterKw.toFixed(3);
      if (input.heaterHours !== undefined)
        changes.heaterHours = input.heaterHours === null ? null : input.heaterHours.toFixed(2);
      if (input.heaterKw != null || input.heaterHours != null) changes.energyKwh = null;
    }
    if (input.tariffCentsPerKwh !== undefined)
      changes.tariffCentsPerKwh = input.tariffCentsPerKwh === null ? null : input.tariffCentsPerKwh.toFixed(4);

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
      for (const [k, v] of Object.entries(input.labResults) as [
        keyof QualityResults,
        QualityResults[keyof QualityResults],
      ][]) {
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
    await audit(
      {
        coopId: actor.coop.id,
        actorUserId: actor.user.id,
        action: 'batch.update',
        entityType: 'batch',
        entityId: id,
        before,
        after: changes,
      },
      t,
    );
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}
