import { z } from 'zod';
import { QUALITY_PROPERTIES } from '@/lib/quality';
import { safeParseMoneyToCents } from '@/lib/money';
import { idSchema } from './common';
import { listQuerySchema } from './list';

// Schemas for supplies, the planner and the batch record, shared by forms and route handlers.
// Volumes typed into forms are in the co-op's units (US gallons or litres) and temperatures in
// °F or °C; the services convert them to litres and °C. Money is typed as "12.34" and becomes
// integer cents here.

/** A number typed as a number or as numeric text ("12.5"); anything else → "Enter a number." */
export const num = (message = 'Enter a number.') =>
  z.preprocess(
    (v) => (typeof v === 'string' && v.trim() !== '' && Number.isFinite(Number(v)) ? Number(v) : v),
    z.number({ error: message }).refine(Number.isFinite, message),
  );

const positive = (what: string, max = 1_000_000) =>
  num().pipe(
    z
      .number()
      .gt(0, `${what} must be more than 0.`)
      .max(max, `${what} must be at most ${max.toLocaleString('en-US')}.`),
  );
const nonNegative = (what: string, max = 1_000_000) =>
  num().pipe(
    z
      .number()
      .min(0, `${what} cannot be negative.`)
      .max(max, `${what} must be at most ${max.toLocaleString('en-US')}.`),
  );
const wholeNonNegative = (what: string, max = 10_000) =>
  num().pipe(
    z
      .number()
      .int(`${what} must be a whole number.`)
      .min(0, `${what} cannot be negative.`)
      .max(max, `${what} must be at most ${max}.`),
  );

/** Purity of a catalyst, % — more than 0 and at most 100. */
export const purityPctSchema = num().pipe(
  z
    .number()
    .gt(0, 'Purity must be more than 0 % and at most 100 %.')
    .max(100, 'Purity must be more than 0 % and at most 100 %.'),
);

/** Money typed as "12.34" (or a number) → integer cents, never negative. */
export const moneyCents = () =>
  z.union([z.string(), z.number()], { error: 'Enter an amount such as 12.34.' }).transform((v, ctx) => {
    const r = safeParseMoneyToCents(String(v));
    if (!r.ok) {
      ctx.addIssue({ code: 'custom', message: `${r.error}.` });
      return z.NEVER;
    }
    if (r.cents < 0) {
      ctx.addIssue({ code: 'custom', message: 'The amount cannot be negative.' });
      return z.NEVER;
    }
    return r.cents;
  });

/** A calendar date, YYYY-MM-DD. */
export const dateSchema = z
  .string({ error: 'Enter a date.' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date such as 2026-11-30.')
  .refine(
    (s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s),
    'That date does not exist.',
  )
  .refine((s) => s >= '2000-01-01' && s <= '2100-12-31', 'Use a date between 2000 and 2100.');

const text = (max: number) => z.string().trim().max(max, `At most ${max} characters.`);
const optionalText = (max: number) =>
  text(max)
    .optional()
    .transform((s) => (s ? s : undefined));
const nullableText = (max: number) =>
  text(max)
    .nullable()
    .optional()
    .transform((s) => (s === '' ? null : s));

export const CHEMICAL_KINDS = ['methanol', 'KOH', 'NaOH', 'other'] as const;
export const CATALYST_KINDS = ['KOH', 'NaOH'] as const;
export const QUANTITY_UNITS = ['L', 'gal', 'g', 'kg', 'lb'] as const;

// ---------------------------------------------------------------- supplies

export const chemicalLotCreateSchema = z
  .strictObject({
    kind: z.enum(CHEMICAL_KINDS, { error: 'Choose methanol, KOH, NaOH or other.' }),
    description: optionalText(120),
    supplier: text(120).min(1, 'Enter the supplier.'),
    receivedOn: dateSchema,
    quantity: positive('Quantity'),
    unit: z.enum(QUANTITY_UNITS, { error: 'Choose L, gal, g, kg or lb.' }),
    totalCost: moneyCents(),
    purityPct: purityPctSchema.optional(),
    notes: optionalText(2000),
  })
  .superRefine((v, ctx) => {
    if (v.kind === 'methanol' && v.unit !== 'L' && v.unit !== 'gal')
      ctx.addIssue({ code: 'custom', path: ['unit'], message: 'Methanol is measured in L or gal.' });
    if ((v.kind === 'KOH' || v.kind === 'NaOH') && v.unit !== 'g' && v.unit !== 'kg' && v.unit !== 'lb')
      ctx.addIssue({ code: 'custom', path: ['unit'], message: 'Catalysts are weighed in g, kg or lb.' });
    if ((v.kind === 'KOH' || v.kind === 'NaOH') && v.purityPct === undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['purityPct'],
        message: 'Enter the purity from the label (KOH flake is usually about 90 %).',
      });
    if ((v.kind === 'methanol' || v.kind === 'other') && v.purityPct !== undefined)
      ctx.addIssue({ code: 'custom', path: ['purityPct'], message: 'Purity is recorded for KOH and NaOH only.' });
    if (v.kind === 'other' && !v.description)
      ctx.addIssue({ code: 'custom', path: ['description'], message: 'Say what the chemical is.' });
  });
export type ChemicalLotCreateInput = z.infer<typeof chemicalLotCreateSchema>;

export const oilLotCreateSchema = z.strictObject({
  collectedFrom: text(120).min(1, 'Say where the oil came from.'),
  collectedOn: dateSchema,
  volume: positive('Volume', 100_000),
  cost: moneyCents().optional(),
  waterNotes: optionalText(2000),
  solidsNotes: optionalText(2000),
  titrationMl: nonNegative('Titration', 50).optional(),
  titrant: z.enum(CATALYST_KINDS, { error: 'Choose KOH or NaOH.' }).optional(),
});
export type OilLotCreateInput = z.infer<typeof oilLotCreateSchema>;

export const chemicalLotListSchema = listQuerySchema(
  ['receivedOn', 'kind', 'supplier', 'remaining', 'cost'],
  'receivedOn',
).extend({
  kind: z.enum(CHEMICAL_KINDS).optional(),
});
export const oilLotListSchema = listQuerySchema(['collectedOn', 'collectedFrom', 'volume', 'titration'], 'collectedOn');

// ---------------------------------------------------------------- planner and batch plan

const planShape = {
  oilVolume: positive('Oil volume', 100_000),
  titrationTrials: z
    .array(nonNegative('A titration trial', 50), { error: 'Give the trials as a list of numbers.' })
    .max(10, 'At most 10 trials.')
    .optional(),
  titrationBlankMl: nonNegative('The blank', 50).optional(),
  oilLotId: idSchema('Choose an oil lot.').optional(),
  catalyst: z.enum(CATALYST_KINDS, { error: 'Choose KOH or NaOH.' }).optional(),
  baseGramsPerLiter: nonNegative('The base amount', 50).optional(),
  purityPct: purityPctSchema.optional(),
  titrantFrom: z.enum(['same-catalyst', 'pure-reagent'], { error: 'Choose how the titrant was made.' }).optional(),
  /** The chemical of the titrant the trials were made with (the batch's catalyst when not given). */
  titrant: z.enum(CATALYST_KINDS, { error: 'Choose KOH or NaOH.' }).optional(),
  methanolMode: z.enum(['percent', 'molar-ratio'], { error: 'Choose percent or molar ratio.' }).optional(),
  methanolPct: num()
    .pipe(z.number().gt(0, 'Methanol % must be more than 0.').max(100, 'Methanol % must be at most 100.'))
    .optional(),
  molarRatio: num()
    .pipe(z.number().gt(0, 'The molar ratio must be more than 0.').max(30, 'The molar ratio must be at most 30.'))
    .optional(),
};

const needsTitration = (v: { titrationTrials?: number[]; oilLotId?: number }, ctx: z.RefinementCtx) => {
  if ((!v.titrationTrials || v.titrationTrials.length === 0) && v.oilLotId === undefined) {
    ctx.addIssue({
      code: 'custom',
      path: ['titrationTrials'],
      message: 'Enter at least one titration trial, or choose an oil lot that has a titration.',
    });
  }
};

export const plannerSchema = z
  .strictObject({
    ...planShape,
    energyKwh: nonNegative('Energy', 10_000).optional(),
    heaterKw: nonNegative('Heater power', 100).optional(),
    heaterHours: nonNegative('Heating time', 100).optional(),
    tariffCentsPerKwh: nonNegative('The tariff', 1_000).optional(),
    /** The oil's temperature before heating, in the co-op's units (°F or °C). */
    startTemp: num().pipe(z.number().min(-40, 'At least −40.').max(200, 'At most 200.')).optional(),
  })
  .superRefine(needsTitration);
export type PlannerInput = z.infer<typeof plannerSchema>;

const oilLotUse = z.strictObject({
  oilLotId: idSchema('Choose an oil lot.'),
  volume: positive('Volume from the lot', 100_000),
});

export const batchCreateSchema = z
  .strictObject({
    ...planShape,
    oilLots: z.array(oilLotUse).max(20, 'At most 20 oil lots.').optional(),
    batchDate: dateSchema.optional(),
    notes: optionalText(4000),
  })
  .superRefine(needsTitration);
export type BatchCreateInput = z.infer<typeof batchCreateSchema>;

// ---------------------------------------------------------------- batch steps

export const DRYING_METHODS = ['air', 'bubble', 'heat', 'vacuum', 'settle', 'other'] as const;
export { QUALITY_PROPERTIES } from '@/lib/quality';

const labNumber = num().pipe(z.number().min(-100, 'Check this value.').max(100_000, 'Check this value.'));
/**
 * A lab result: the value with its method, laboratory (or "home test") and date. A bare number is
 * still accepted (screening only: without laboratory, method and date it earns no standard verdict).
 */
export const labValue = z
  .union([
    labNumber,
    z.strictObject({
      value: labNumber,
      method: text(60).min(1, 'Name the test method, e.g. ASTM D93.'),
      laboratory: text(120).min(1, 'Name the laboratory, or write "home test".'),
      date: dateSchema,
    }),
  ])
  .nullable();

export const quickTestsSchema = z.strictObject({
  test327: z
    .strictObject({
      result: z.enum(['clear', 'fallout'], { error: 'Choose clear or fall-out.' }),
      falloutMl: nonNegative('Fall-out', 30).optional(),
    })
    .nullable()
    .optional(),
  soap: z
    .strictObject({ hclMl: nonNegative('HCl volume', 100), sampleGrams: positive('Sample mass', 1000) })
    .nullable()
    .optional(),
  washTest: z.enum(['clean-split', 'emulsion'], { error: 'Choose clean split or emulsion.' }).nullable().optional(),
  water: z.enum(['clear', 'hazy'], { error: 'Choose clear or hazy.' }).nullable().optional(),
});

export const batchUpdateSchema = z
  .strictObject({
    // the plan (only while the batch is planned)
    oilVolume: planShape.oilVolume.optional(),
    titrationTrials: z
      .array(nonNegative('A titration trial', 50))
      .min(1, 'Enter at least one titration trial.')
      .max(10)
      .optional(),
    titrationBlankMl: planShape.titrationBlankMl,
    catalyst: planShape.catalyst,
    titrant: planShape.titrant,
    baseGramsPerLiter: planShape.baseGramsPerLiter,
    purityPct: planShape.purityPct,
    titrantFrom: planShape.titrantFrom,
    methanolMode: planShape.methanolMode,
    methanolPct: planShape.methanolPct,
    molarRatio: planShape.molarRatio,
    oilLots: z.array(oilLotUse).max(20).optional(),
    batchDate: dateSchema.optional(),
    // reaction and the steps after it
    actualCatalystGrams: nonNegative('Catalyst used', 100_000).nullable().optional(),
    actualMethanol: nonNegative('Methanol used', 10_000).nullable().optional(),
    mixingMinutes: wholeNonNegative('Mixing time', 10_000).nullable().optional(),
    settlingHours: nonNegative('Settling time', 1_000).nullable().optional(),
    glycerinDrained: nonNegative('Glycerin drained', 10_000).nullable().optional(),
    washCycles: wholeNonNegative('Wash cycles', 50).nullable().optional(),
    washWater: nonNegative('Wash water', 100_000).nullable().optional(),
    dryingMethod: z.enum(DRYING_METHODS, { error: 'Choose a drying method.' }).nullable().optional(),
    dryingNotes: nullableText(2000),
    quickTests: quickTestsSchema.optional(),
    labResults: z.partialRecord(z.enum(QUALITY_PROPERTIES), labValue).optional(),
    qualityStandard: z.enum(['ASTM D6751', 'EN 14214'], { error: 'Choose ASTM D6751 or EN 14214.' }).optional(),
    energyKwh: nonNegative('Energy', 10_000).nullable().optional(),
    heaterKw: nonNegative('Heater power', 100).nullable().optional(),
    heaterHours: nonNegative('Heating time', 100).nullable().optional(),
    tariffCentsPerKwh: nonNegative('The tariff', 1_000).nullable().optional(),
    feedstockCost: moneyCents().nullable().optional(),
    otherCost: moneyCents().optional(),
    otherNotes: nullableText(2000),
    notes: nullableText(4000),
  })
  .superRefine((v, ctx) => {
    if (v.energyKwh != null && (v.heaterKw != null || v.heaterHours != null)) {
      ctx.addIssue({
        code: 'custom',
        path: ['energyKwh'],
        message: 'Give either metered kWh or heater kW × hours, not both.',
      });
    }
  });
export type BatchUpdateInput = z.infer<typeof batchUpdateSchema>;

export const BATCH_STEPS = ['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing'] as const;
export const batchAdvanceSchema = z.strictObject({
  to: z.enum(['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'], { error: 'Choose the next step.' }),
});
export const batchReleaseSchema = z.strictObject({
  tankId: idSchema('Choose a tank.'),
  volume: positive('Volume released', 100_000),
  /** Why the batch is released although it does not meet the standard in full (required then). */
  reason: z.string().trim().max(2000, 'At most 2000 characters.').optional(),
});
export const batchRejectSchema = z.strictObject({
  reason: z
    .string({ error: 'Say why the batch is rejected.' })
    .trim()
    .min(3, 'Say why the batch is rejected (at least 3 characters).')
    .max(2000, 'At most 2000 characters.'),
});
export const temperatureCreateSchema = z.strictObject({
  temp: num('Enter the temperature as a number.').pipe(
    z.number().min(-40, 'Check this reading.').max(390, 'Check this reading.'),
  ),
  measuredAt: z.iso.datetime({ offset: true, error: 'Use a date and time such as 2026-11-30T14:05:00Z.' }).optional(),
});

export const batchListSchema = listQuerySchema(
  ['number', 'date', 'status', 'volume', 'costPerGallon'],
  'number',
).extend({
  status: z
    .enum(
      [
        'planned',
        'reacting',
        'settling',
        'draining',
        'washing',
        'drying',
        'testing',
        'released',
        'rejected',
        'in-progress',
      ],
      {
        error: 'Filter by a batch status.',
      },
    )
    .optional(),
});
