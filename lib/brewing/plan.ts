import 'server-only';
import {
  catalystGrams,
  convertCatalystGrams,
  DEFAULT_BASE_GRAMS_PER_LITER,
  DEFAULT_METHANOL_PERCENT,
  expectedYields,
  acidNumber,
  ffaPercentFromAcidNumber,
  kohEquivalentTitrationMl,
  methanolLitersByMolarRatio,
  methanolLitersByPercent,
  molarRatioFromPercent,
  oilQualityBand,
  percentFromMolarRatio,
  projectedFuelYield,
  titrationAverage,
  TYPICAL_PURITY_PCT,
  USUAL_MOLAR_RATIO,
  type CatalystResult,
  type TitrantSource,
  type YieldHistoryBatch,
} from '@/lib/chemistry';
import type { z } from 'zod';
import type { computedPlanSchema } from '@/lib/api/dto/brewing';
import type { UnitSystem } from '@/lib/units';
import { invalidFields } from '@/lib/http';
import type { CoopSettings } from '@/models/Coop';

export type Catalyst = 'KOH' | 'NaOH';

/** What the planner and a batch's plan start from (volumes already in litres). */
export interface PlanInput {
  oilLiters: number;
  /**
   * The titration: trials typed in (titrant = the batch's catalyst unless given), or an oil lot's
   * titration; null when there is none (→ 422 on titrationTrials).
   */
  titration: { source: 'trials' | 'oil-lot'; trials: number[]; titrant?: Catalyst; oilLotId?: number | null } | null;
  titrationBlankMl?: number;
  catalyst?: Catalyst;
  baseGramsPerLiter?: number;
  purityPct?: number;
  /** Purity of the lot FIFO would use next, preferred over the recipe's when no purity is typed. */
  nextLotPurityPct?: number | null;
  titrantFrom?: TitrantSource;
  methanolMode?: 'percent' | 'molar-ratio';
  methanolPct?: number;
  molarRatio?: number;
}

/** The computed plan: every figure with where its inputs came from (the API's ComputedPlan). */
export type ComputedPlan = z.infer<typeof computedPlanSchema>;

/** Options for {@link computePlan}. */
export interface PlanOptions {
  /** Units for the catalyst explanation; default 'metric'. */
  system?: UnitSystem;
  /** The co-op's recent released batches, newest first (for the yield projection). */
  yieldHistory?: readonly YieldHistoryBatch[];
}

const bad = (field: string, reason: string) => invalidFields({ [field]: [reason] });

/**
 * Works out a batch's chemistry from its inputs and the co-op's recipe defaults, with the pure
 * lib/chemistry functions: titration average (with outliers), catalyst grams by the purity rule
 * for the titrant, methanol by % of oil or molar ratio, acid number / FFA with the oil band,
 * and the expected yields. Range problems come back as 422 with the field named.
 */
export function computePlan(
  input: PlanInput,
  recipe: CoopSettings['recipe'] = {},
  options: PlanOptions = {},
): ComputedPlan {
  const catalyst: Catalyst = input.catalyst ?? recipe?.catalyst ?? 'KOH';
  const recipeFits = recipe?.catalyst === undefined || recipe.catalyst === catalyst;

  const baseSource: ComputedPlan['baseSource'] =
    input.baseGramsPerLiter !== undefined
      ? 'typed'
      : recipeFits && recipe?.baseGramsPerLiter !== undefined
        ? 'recipe'
        : 'default';
  const baseGramsPerLiter =
    input.baseGramsPerLiter ??
    (baseSource === 'recipe' ? recipe!.baseGramsPerLiter! : DEFAULT_BASE_GRAMS_PER_LITER[catalyst]);

  let puritySource: ComputedPlan['puritySource'] = 'typed';
  let purityPct = input.purityPct;
  if (purityPct === undefined && input.nextLotPurityPct)
    [purityPct, puritySource] = [input.nextLotPurityPct, 'next-lot'];
  if (purityPct === undefined && recipeFits && recipe?.purityPct !== undefined)
    [purityPct, puritySource] = [recipe.purityPct, 'recipe'];
  if (purityPct === undefined) [purityPct, puritySource] = [TYPICAL_PURITY_PCT[catalyst], 'typical'];

  if (!input.titration || input.titration.trials.length === 0) {
    throw bad('titrationTrials', 'Enter at least one titration trial, or choose an oil lot that has a titration.');
  }
  const { trials, source } = input.titration;
  const titrant: Catalyst = input.titration.titrant ?? catalyst;
  // A titrant of the other chemical is never the batch's own stock: pure reagent unless said otherwise (then 422).
  const titrantFrom: TitrantSource = input.titrantFrom ?? (titrant === catalyst ? 'same-catalyst' : 'pure-reagent');
  if (titrant !== catalyst && titrantFrom === 'same-catalyst') {
    throw bad(
      'titrantFrom',
      `A ${titrant} titrant cannot have been made from this batch's ${catalyst}: choose pure reagent, or titrate with ${catalyst} made from the batch's stock.`,
    );
  }

  let avg: ReturnType<typeof titrationAverage>;
  try {
    avg = titrationAverage(trials, input.titrationBlankMl ?? 0);
  } catch (e) {
    throw bad(
      String((e as Error).message).includes('blank') ? 'titrationBlankMl' : 'titrationTrials',
      (e as Error).message + '.',
    );
  }
  const averageForCatalystMl = convertCatalystGrams(avg.averageMl, titrant, catalyst);

  let catalystResult: CatalystResult;
  try {
    catalystResult = catalystGrams({
      catalyst,
      titrant,
      oilLiters: input.oilLiters,
      baseGramsPerLiter,
      titrationMl: avg.averageMl,
      purityPct,
      titrantFrom,
      system: options.system,
    });
  } catch (e) {
    throw bad('purityPct', (e as Error).message + '.');
  }

  const mode =
    input.methanolMode ??
    (input.molarRatio !== undefined && input.methanolPct === undefined ? 'molar-ratio' : 'percent');
  let methanol: ComputedPlan['methanol'];
  if (mode === 'percent') {
    const pct = input.methanolPct ?? recipe?.methanolPct ?? DEFAULT_METHANOL_PERCENT;
    methanol = {
      mode,
      pct,
      molarRatio: null,
      liters: methanolLitersByPercent(input.oilLiters, pct),
      equivalentPct: pct,
      equivalentMolarRatio: molarRatioFromPercent(pct),
    };
  } else {
    const ratio = input.molarRatio ?? USUAL_MOLAR_RATIO;
    methanol = {
      mode,
      pct: null,
      molarRatio: ratio,
      liters: methanolLitersByMolarRatio(input.oilLiters, ratio),
      equivalentPct: percentFromMolarRatio(ratio),
      equivalentMolarRatio: ratio,
    };
  }

  const band = oilQualityBand(kohEquivalentTitrationMl(avg.averageMl, titrant));
  const an = acidNumber({ titrationMl: avg.averageMl, titrant });

  const yieldProjection = projectedFuelYield(options.yieldHistory ?? []);
  return {
    oilLiters: input.oilLiters,
    titration: {
      source,
      oilLotId: input.titration.oilLotId ?? null,
      trials: avg.trials,
      blankMl: avg.blankMl,
      averageMl: avg.averageMl,
      titrant,
      averageForCatalystMl,
      outlierIndexes: avg.outlierIndexes,
      spreadMl: avg.spreadMl,
      averageWithoutOutliersMl: avg.averageWithoutOutliersMl,
      spreadTooWide: avg.spreadTooWide,
      notice: avg.notice,
    },
    catalyst,
    baseGramsPerLiter,
    baseSource,
    purityPct,
    puritySource,
    titrantFrom,
    catalystResult,
    methanol,
    oil: {
      acidNumber: an,
      ffaPercent: ffaPercentFromAcidNumber(an),
      band: band.band,
      needsAcidPretreatment: band.needsAcidPretreatment,
      reject: band.reject,
      message: band.message,
    },
    yields: (({ assumptions, ...y }) => ({ ...y, assumptions: [...assumptions] }))(
      expectedYields(input.oilLiters, methanol.liters),
    ),
    yieldProjection,
    projectedFuelLiters: input.oilLiters * yieldProjection.ratio,
  };
}
