import { z } from 'zod';
import { QUALITY_PROPERTIES, SCREENING_CAUTION } from '@/lib/quality';
import { date, day, int, num, str } from './common';
import { computedPlanSchema } from './brewing';

// One batch as the API sends it (the full record for brewers and admins, a released batch's
// summary for others) and a temperature reading; lib/brewing' BatchDto, BatchSummaryDto and
// TemperatureDto are inferred from these (one definition).

const catalyst = z.enum(['KOH', 'NaOH']);
const standard = z.enum(['ASTM D6751', 'EN 14214']);
const status = z.enum([
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
]);
const qualityVerdict = z.enum(['pass', 'fail', 'incomplete']);

export const batchFilePurpose = z.enum(['photo', 'lab-report', 'receipt']);

/** A photo, lab report or disposal receipt attached to a batch. */
export const batchFileSchema = z
  .object({
    id: int(),
    purpose: batchFilePurpose,
    kind: z.enum(['pdf', 'jpeg', 'png']).describe('As recognised from its first bytes'),
    name: str(),
    sizeBytes: int(),
    createdAt: date(),
  })
  .meta({ id: 'BatchFile' });

/** A brewer acknowledged the batch's Danger temperature readings. */
export const dangerAcknowledgedSchema = z.object({ acknowledged: z.literal(true) });
const screeningVerdict = z.enum(['looks-good', 'needs-attention', 'incomplete']);

export const temperatureSchema = z
  .object({
    id: str().describe('The BIGINT id, as a string'),
    measuredAt: date(),
    tempC: num(),
    level: z.enum(['ok', 'cold', 'warning', 'danger']),
    message: str().describe("The check's wording, in the co-op's units"),
  })
  .meta({ id: 'Temperature' });

export const quickTestsSchema = z
  .object({
    test327: z.object({ result: z.enum(['clear', 'fallout']), falloutMl: num().optional() }).optional(),
    soap: z.object({ hclMl: num(), sampleGrams: num() }).optional(),
    washTest: z.enum(['clean-split', 'emulsion']).optional(),
    water: z.enum(['clear', 'hazy']).optional(),
  })
  .meta({ id: 'QuickTests' });

export const quickTestEvaluationSchema = z
  .object({
    items: z.array(
      z.object({
        test: z.enum(['test327', 'soap', 'washTest', 'water']),
        label: str(),
        status: z.enum(['looks-good', 'needs-attention', 'recorded', 'not tested']),
        detail: str(),
        soapPpm: num().optional(),
      }),
    ),
    overall: screeningVerdict,
    caution: z.literal(SCREENING_CAUTION),
  })
  .meta({ id: 'QuickTestEvaluation', description: 'Home quick tests: screening only, never a pass.' });

const labResultSchema = z.object({
  value: num(),
  method: str().nullable().optional(),
  laboratory: str().nullable().optional(),
  date: str().nullable().optional(),
});

export const labResultsSchema = z
  .partialRecord(z.enum(QUALITY_PROPERTIES), z.union([num(), labResultSchema]).nullable().optional())
  .meta({
    id: 'LabResults',
    description: 'By property: a bare value (screening only) or a value with its method, laboratory and date.',
  });

export const qualityEvaluationSchema = z
  .object({
    standard,
    rows: z.array(
      z.object({
        property: z.enum(QUALITY_PROPERTIES),
        label: str(),
        unit: str(),
        standard,
        verdict: z.enum(['pass', 'fail', 'not tested', 'reported', 'screened-within', 'screened-outside']),
        value: num().nullable(),
        limitText: str(),
        standardMethod: str(),
        source: str(),
        required: z.boolean(),
        method: str().nullable(),
        laboratory: str().nullable(),
        date: str().nullable(),
        isLaboratory: z.boolean(),
        note: str().optional(),
      }),
    ),
    overall: qualityVerdict,
    verdict: z.object({
      kind: z.enum(['meets', 'fails', 'screened']),
      text: str(),
      testedCount: int(),
      requiredCount: int(),
      failing: z.array(str()),
      screenedOutside: z.array(str()),
    }),
    untestedCount: int(),
    caution: z.literal(SCREENING_CAUTION),
  })
  .meta({ id: 'QualityEvaluation' });

export const batchCostsSchema = z.object({
  methanolCents: int(),
  catalystCents: int(),
  energyCents: int(),
  feedstockCents: int(),
  otherCents: int(),
  totalCents: int(),
  costPerGallonCents: num().nullable(),
  costPerLiterCents: num().nullable(),
});

const nullableNum = () => num().nullable();

/** Everything the batch page shows (brewers and admins). Volumes litres, temperatures °C, money cents. */
export const batchFullSchema = z
  .object({
    view: z.literal('full'),
    id: int(),
    number: int(),
    status,
    batchDate: day(),
    statusChangedAt: date(),
    createdAt: date(),
    oilLiters: num(),
    oilLots: z.array(
      z.object({ oilLotId: int(), collectedFrom: str(), collectedOn: day(), liters: num(), feedstockCents: int() }),
    ),
    plan: computedPlanSchema,
    computedCatalystGrams: num(),
    computedMethanolLiters: num(),
    actualCatalystGrams: nullableNum(),
    actualMethanolLiters: nullableNum(),
    mixingMinutes: nullableNum(),
    settlingHours: nullableNum(),
    glycerinLiters: nullableNum(),
    washCycles: nullableNum(),
    washWaterLiters: nullableNum(),
    dryingMethod: str().nullable(),
    dryingNotes: str().nullable(),
    temperatures: z.array(temperatureSchema),
    quickTests: quickTestsSchema,
    quickTestEvaluation: quickTestEvaluationSchema,
    labResults: labResultsSchema,
    quality: qualityEvaluationSchema,
    qualityVerdict,
    screeningVerdict,
    energy: z.object({
      kwh: nullableNum(),
      heaterKw: nullableNum(),
      heaterHours: nullableNum(),
      tariffCentsPerKwh: nullableNum(),
      costCents: nullableNum(),
    }),
    feedstockCentsOverride: nullableNum(),
    feedstockFromLotsCents: int(),
    otherCents: int(),
    otherNotes: str().nullable(),
    release: z
      .object({ tankId: int(), tankName: str().nullable(), releasedLiters: num(), releasedAt: date() })
      .nullable(),
    rejectedAt: date().nullable(),
    rejectReason: str().nullable(),
    costs: batchCostsSchema.nullable(),
    consumptions: z.array(
      z.object({
        chemicalLotId: int(),
        kind: str(),
        supplier: str(),
        receivedOn: day(),
        unit: z.enum(['L', 'g']),
        quantity: num(),
        costCents: int(),
      }),
    ),
    files: z.array(batchFileSchema),
    notes: str().nullable(),
  })
  .meta({
    id: 'Batch',
    description: "A batch's full record: plan, steps, temperatures, quality, costs (brewers and admins).",
  });

/** What members and treasurers see of a released batch (and everyone of an imported one). */
export const batchSummarySchema = z
  .object({
    view: z.literal('summary'),
    id: int(),
    number: int(),
    status,
    batchDate: day(),
    oilLiters: num(),
    catalyst: catalyst.nullable().describe('null for an imported past batch recorded without one'),
    release: z.object({ releasedLiters: num(), releasedAt: date(), tankName: str().nullable() }).nullable(),
    costPerGallonCents: num().nullable(),
    costPerLiterCents: num().nullable(),
    quickTestEvaluation: quickTestEvaluationSchema,
    quality: qualityEvaluationSchema,
    qualityVerdict,
    screeningVerdict,
    imported: z
      .object({ notes: str().nullable() })
      .nullable()
      .describe('An imported past batch: its notes as recorded then; null for any other'),
  })
  .meta({ id: 'BatchSummary' });

export const batchSchema = batchFullSchema;
export { status as batchStatus, qualityVerdict };
export const batchOrSummarySchema = z.discriminatedUnion('view', [batchFullSchema, batchSummarySchema]);
