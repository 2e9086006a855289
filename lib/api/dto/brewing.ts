import { z } from 'zod';
import { day, int, num, str, units } from './common';

// Supplies and the batch list as the API sends them; lib/supplies' and lib/brewing' DTO types
// are inferred from these (one definition).

export const chemicalLotSchema = z
  .object({
    id: int(),
    kind: z.enum(['methanol', 'KOH', 'NaOH', 'other']),
    description: str().nullable(),
    supplier: str(),
    receivedOn: day(),
    unit: z.enum(['L', 'g']).describe('L for methanol, g for catalysts'),
    quantity: num(),
    remaining: num(),
    consumed: num(),
    totalCostCents: int(),
    purityPct: num().nullable(),
    hasSafetyDataSheet: z.boolean(),
    safetyDataSheetName: str().nullable(),
    notes: str().nullable(),
  })
  .meta({ id: 'ChemicalLot' });

export const oilLotSchema = z
  .object({
    id: int(),
    collectedFrom: str(),
    collectedOn: day(),
    volumeLiters: num(),
    usedLiters: num(),
    remainingLiters: num(),
    costCents: int(),
    waterNotes: str().nullable(),
    solidsNotes: str().nullable(),
    titrationMl: num().nullable(),
    titrant: z.enum(['KOH', 'NaOH']).nullable(),
  })
  .meta({ id: 'OilLot' });

export const stockLineSchema = z
  .object({
    kind: z.enum(['methanol', 'KOH', 'NaOH']),
    unit: z.enum(['L', 'g']),
    onHand: num().describe('Received − consumed by released or rejected batches'),
    committed: num().describe('Planned amounts of batches under way (reacting … testing)'),
    available: num().describe('onHand − committed'),
    lotsWithStock: int(),
    nextPlannedNeed: num().nullable().describe('What the next planned batch needs of this chemical'),
    low: z.boolean().describe("The available stock won't cover the next planned batch"),
  })
  .meta({ id: 'StockLine' });

export const stockSummarySchema = z
  .object({
    lines: z.array(stockLineSchema),
    nextPlannedBatch: z.object({ id: int(), number: int(), catalyst: z.enum(['KOH', 'NaOH']) }).nullable(),
  })
  .meta({ id: 'StockSummary' });

export const batchRowSchema = z
  .object({
    id: int(),
    number: int(),
    status: z.enum([
      'planned',
      'reacting',
      'settling',
      'draining',
      'washing',
      'drying',
      'testing',
      'released',
      'rejected',
      'imported',
    ]),
    batchDate: day(),
    oilLiters: num(),
    releasedLiters: num().nullable(),
    costPerGallonCents: num().nullable(),
    costPerLiterCents: num().nullable(),
    qualityStandard: z.enum(['ASTM D6751', 'EN 14214']),
    qualityVerdict: z.enum(['pass', 'fail', 'incomplete']),
    qualityText: str().describe('"Meets …", "Fails: …" or "Screened — n of m …"'),
    qualityKind: z.enum(['meets', 'fails', 'screened']),
    screeningVerdict: z.enum(['looks-good', 'needs-attention', 'incomplete']),
  })
  .meta({ id: 'BatchRow' });

// ---------------------------------------------------------------- the plan and the planner

const catalyst = z.enum(['KOH', 'NaOH']);

/** A computed plan: every figure with where its inputs came from (lib/brewing/plan.ts's ComputedPlan is inferred from it). */
export const computedPlanSchema = z
  .object({
    oilLiters: num(),
    titration: z.object({
      source: z.enum(['trials', 'oil-lot']),
      oilLotId: int().nullable(),
      trials: z.array(num()),
      blankMl: num(),
      averageMl: num().describe('Average minus blank, mL of titrant per mL of oil (as made with `titrant`)'),
      titrant: catalyst,
      averageForCatalystMl: num().describe(
        "The average in the batch's catalyst (converted by molar mass when the titrant differs)",
      ),
      outlierIndexes: z.array(int()),
      spreadMl: num(),
      spreadTooWide: z.boolean(),
      averageWithoutOutliersMl: num().nullable(),
      notice: str().nullable().describe('What to tell the brewer about the trials, or null'),
    }),
    catalyst,
    baseGramsPerLiter: num(),
    baseSource: z.enum(['typed', 'recipe', 'default']),
    purityPct: num(),
    puritySource: z.enum(['typed', 'next-lot', 'recipe', 'typical']),
    titrantFrom: z.enum(['same-catalyst', 'pure-reagent']),
    catalystResult: z.object({
      gramsPerLiter: num(),
      totalGrams: num(),
      rule: z.enum(['base-over-purity-plus-titration', 'all-over-purity', 'converted-all-over-purity']),
      titrationPureGramsPerLiter: num(),
      explanation: str(),
    }),
    methanol: z.object({
      mode: z.enum(['percent', 'molar-ratio']),
      pct: num().nullable(),
      molarRatio: num().nullable(),
      liters: num(),
      equivalentPct: num(),
      equivalentMolarRatio: num(),
    }),
    oil: z.object({
      acidNumber: num(),
      ffaPercent: num(),
      band: z.enum(['good', 'average', 'poor', 'very-poor', 'reject']),
      needsAcidPretreatment: z.boolean(),
      reject: z.boolean(),
      message: str(),
    }),
    yields: z.object({
      fuelLiters: num(),
      fuelKg: num(),
      glycerolLiters: num(),
      crudeGlycerinLiters: num(),
      crudeGlycerinRangeLiters: z.tuple([num(), num()]),
      glycerolKg: num(),
      methanolReactedLiters: num(),
      excessMethanolLiters: num(),
      conversionFraction: num(),
      assumptions: z.array(str()),
    }),
    yieldProjection: z.object({
      ratio: num(),
      source: z.enum(['history', 'ideal']),
      batches: int(),
      idealRatio: num(),
      explanation: str(),
    }),
    projectedFuelLiters: num().describe('Oil × the projected yield, L'),
  })
  .meta({ id: 'ComputedPlan' });

/** Stock check and projected cost of one chemical for a planned batch. */
export const chemicalCoverageSchema = z
  .object({
    kind: z.enum(['methanol', 'KOH', 'NaOH']),
    unit: z.enum(['L', 'g']),
    needed: num(),
    available: num().describe('Stock the lots hold minus what batches under way will take'),
    covered: z.boolean(),
    shortBy: num(),
    projectedCents: int().describe(
      'The needed quantity at current lot prices, FIFO; a shortfall at the last price paid',
    ),
    shortfallCents: int()
      .nullable()
      .describe('The shortfall at the last price paid; null when nothing is short or none was ever bought'),
  })
  .meta({ id: 'ChemicalCoverage' });

/** The planner's answer: the chemistry, the stock check and the projected costs (lib/brewing/planner.ts's PlannerResult). */
export const plannerResultSchema = z
  .object({
    units,
    plan: computedPlanSchema,
    coverage: z.array(chemicalCoverageSchema),
    projected: z.object({
      methanolCents: int(),
      catalystCents: int(),
      energyCents: int(),
      energySource: z.enum(['metered', 'heater', 'estimate', 'none']),
      energyKwh: num().nullable(),
      feedstockCents: int(),
      totalCents: int(),
      costPerGallonCents: num().nullable().describe('Per US gallon of expected fuel'),
      costPerLiterCents: num().nullable(),
      incomplete: z.boolean().describe('Some chemical is short and unpriced'),
    }),
    notes: z.array(str()),
  })
  .meta({ id: 'PlannerResult' });
export type PlannerResultDto = z.infer<typeof plannerResultSchema>;
