import 'server-only';
import type { Transaction, InferAttributes } from 'sequelize';
import type { z } from 'zod';
import type { quickTestsSchema } from '@/lib/api/dto/batch';
import { conflict, notFound } from '@/lib/http';
import type { QuickTestInput, QualityResults } from '@/lib/quality';
import { numericOrNull } from '@/lib/units/quantity';
import { Batch } from '@/models';
import type { Catalyst, PlanInput } from './plan';

// A batch as stored: loading one of the co-op's, and the pure readings of its columns (recipe,
// plan inputs, quick tests and lab results).

/** A batch as stored (NUMERIC and BIGINT columns as strings). */
export type BatchRecord = InferAttributes<Batch>;

/** Quick tests as stored (the soap test's catalyst comes from the batch): the API's QuickTests. */
export type QuickTestsStored = z.infer<typeof quickTestsSchema>;

/** Reads one batch of the co-op (404 otherwise), locked FOR UPDATE in the transaction when `lock` is set. */
export async function loadBatch(
  coopId: number,
  id: number,
  transaction?: Transaction,
  lock = false,
): Promise<BatchRecord> {
  if (!Number.isSafeInteger(id) || id <= 0) throw notFound('Batch not found.');
  const row = await Batch.findOne({
    where: { id, coopId },
    raw: true,
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!row) throw notFound('Batch not found.');
  return row;
}

/** The recipe columns: set on every batch brewed here, NULL on an imported past batch only. */
const RECIPE_FIELDS = [
  'titrationTrialsMl',
  'titrant',
  'titrationAvgMl',
  'catalyst',
  'baseGPerL',
  'purityPct',
  'titrantFrom',
  'catalystRule',
  'methanolMode',
  'computedCatalystGrams',
  'computedMethanolLiters',
] as const satisfies readonly (keyof BatchRecord)[];
type RecipeField = (typeof RECIPE_FIELDS)[number];

/** A batch brewed here (not an imported summary): its recipe columns are all set. */
export type BrewedBatch = Omit<BatchRecord, RecipeField> & { [K in RecipeField]: NonNullable<BatchRecord[K]> };

export const isBrewed = (row: BatchRecord): row is BrewedBatch =>
  row.status !== 'imported' && RECIPE_FIELDS.every((f) => row[f] !== null);

/**
 * loadBatch for the actions that work from the recipe (change, release, reject, certificate): an
 * imported past batch has none and is read-only, so it is a 409.
 */
export async function loadBrewedBatch(
  coopId: number,
  id: number,
  transaction?: Transaction,
  lock = false,
): Promise<BrewedBatch> {
  const row = await loadBatch(coopId, id, transaction, lock);
  if (!isBrewed(row))
    throw conflict(
      `Batch ${row.number} was imported from past records: it has no recipe or steps and cannot be changed here.`,
    );
  return row;
}

/** The quick tests and lab results of a batch in lib/quality's shapes (stored as JSONB). */
export const quickTestsOf = (row: Pick<BatchRecord, 'quickTests'>): QuickTestsStored =>
  (row.quickTests ?? {}) as QuickTestsStored;
export const labResultsOf = (row: Pick<BatchRecord, 'labResults'>): QualityResults =>
  (row.labResults ?? {}) as QualityResults;

/** The plan inputs a stored batch was computed from. */
export function planInputOf(row: BrewedBatch): PlanInput {
  return {
    oilLiters: Number(row.oilLiters),
    titration: { source: row.titrationSource, trials: row.titrationTrialsMl.map(Number), titrant: row.titrant },
    titrationBlankMl: Number(row.titrationBlankMl),
    catalyst: row.catalyst,
    baseGramsPerLiter: Number(row.baseGPerL),
    purityPct: Number(row.purityPct),
    // Records from before titrant-aware plans may say 'same-catalyst' for a titrant of the other
    // chemical, which cannot be; such a titrant was reagent, and the plan says which rule it applied.
    titrantFrom: row.titrant !== row.catalyst ? 'pure-reagent' : row.titrantFrom,
    methanolMode: row.methanolMode,
    methanolPct: numericOrNull(row.methanolPct) ?? undefined,
    molarRatio: numericOrNull(row.molarRatio) ?? undefined,
  };
}

/** Quick tests in the shape lib/quality wants (the soap test takes the batch's catalyst). */
export function quickTestInput(stored: QuickTestsStored, catalyst: Catalyst | null): QuickTestInput {
  return {
    ...(stored.test327 ? { test327: stored.test327 } : {}),
    ...(stored.soap && catalyst ? { soap: { ...stored.soap, catalyst } } : {}),
    ...(stored.washTest ? { washTest: stored.washTest } : {}),
    ...(stored.water ? { water: stored.water } : {}),
  };
}
