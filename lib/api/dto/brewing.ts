import { z } from 'zod';
import { day, int, num, str } from './common';

// Supplies and the batch list as the API sends them; lib/supplies' and lib/batches' DTO types
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
    low: z.boolean().describe('The available stock won\'t cover the next planned batch'),
  })
  .meta({ id: 'StockLine' });

export const stockSummarySchema = z
  .object({ lines: z.array(stockLineSchema), nextPlannedBatch: z.object({ id: int(), number: int(), catalyst: z.enum(['KOH', 'NaOH']) }).nullable() })
  .meta({ id: 'StockSummary' });

export const batchRowSchema = z
  .object({
    id: int(),
    number: int(),
    status: z.enum(['planned', 'reacting', 'settling', 'draining', 'washing', 'drying', 'testing', 'released', 'rejected', 'imported']),
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
