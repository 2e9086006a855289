import { z } from 'zod';
import { batchStatus, qualityVerdict } from './batch';
import { date, int, num, str, units } from './common';
import { movementKind, tankMixing } from './tank';

// Lineage and recall as the API sends them: where a batch's fuel went, its reviews, the recall
// report and a tank's layers. lib/lineage's DTO types are inferred from these (one definition).

export const reviewSchema = z
  .object({
    id: int(),
    status: z.enum(['open', 'closed']),
    cause: z.enum(['lab-result', 'flag']),
    finding: str(),
    heldLiters: num().describe('Fuel of the batch held in tanks while the review was open, L'),
    openedAt: date(),
    outcome: z.enum(['cleared', 'retreated', 'disposed']).nullable(),
    outcomeNotes: str().nullable(),
    disposalMethod: str().nullable(),
    receiptFileId: int().nullable(),
    retreatBatchId: int().nullable(),
    closedAt: date().nullable(),
  })
  .meta({
    id: 'BatchReview',
    description: 'A review of a released batch: finding, held fuel, outcome.',
  });

export const lineageDrawSchema = z.object({
  drawId: int(),
  occurredAt: date(),
  tankName: str(),
  membershipId: int(),
  memberName: str(),
  batchMl: int().describe('Millilitres of this batch the member received by this entry (negative on a reversal)'),
  batchQuantity: num().describe("The same in the co-op's unit"),
  drawMl: int().describe('The whole draw (negative on a reversal)'),
  drawQuantity: num(),
  valueCents: int().describe("The part of the draw's fuel charge for this batch's fuel (negative on a reversal)"),
  isReversal: z.boolean(),
});

export const lineageMemberSchema = z.object({
  membershipId: int(),
  name: str(),
  email: str(),
  batchMl: int().describe('Net of reversals'),
  batchQuantity: num(),
  valueCents: int().describe("Fuel charge for the batch's fuel they received: the possible credit"),
});

const lineageFields = {
  batchId: int(),
  number: int(),
  status: batchStatus,
  units,
  inTanks: z
    .array(
      z.object({
        tankId: int(),
        tankName: str(),
        mixing: tankMixing,
        ml: int(),
        quantity: num(),
        heldLiters: num(),
      }),
    )
    .describe("Where the batch's fuel is now"),
  byKind: z
    .partialRecord(movementKind, int())
    .describe('Net millilitres by ledger kind (released in, drawn out, moved, adjusted, disposed of …), signed'),
  draws: z.array(lineageDrawSchema),
  members: z.array(lineageMemberSchema),
  reviews: z.array(reviewSchema),
};

export const batchLineageSchema = z.object(lineageFields).meta({
  id: 'BatchLineage',
  description: "Tanks, draws and members that hold or received the batch's fuel, and its reviews.",
});

export const recallReportSchema = z
  .object({ ...lineageFields, coopName: str(), generatedAt: date() })
  .meta({ id: 'RecallReport', description: "A batch's lineage as a report of the co-op, dated." });

export const lateLabResultAnsweredSchema = z.object({
  qualityVerdict: qualityVerdict.describe("The batch's verdict re-derived with the new results"),
  review: reviewSchema.nullable().describe('The review a failing required property opened, if any'),
});

export const tankLayersSchema = z
  .object({
    tankId: int(),
    tankName: str(),
    mixing: tankMixing,
    units,
    onHand: num().describe("In the co-op's unit"),
    held: num(),
    heldLiters: num(),
    layers: z.array(
      z.object({
        id: int(),
        batchId: int().nullable().describe('null for fuel that came from no batch record (an opening stock)'),
        batchNumber: int().nullable(),
        quantity: num(),
        quantityLiters: num(),
        sharePct: num().describe('Share of the on-hand fuel, %, 1 decimal'),
        underReview: z.boolean(),
      }),
    ),
  })
  .meta({ id: 'TankLayers', description: "A tank's fuel by batch, oldest first, its mixing model and what is held." });
