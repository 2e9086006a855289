import { z } from 'zod';
import { date, day, int, num, str } from './common';
import { role } from './members';

// The co-op's first screen as the API sends it; lib/overview's types are inferred from these.

const litres = () => str().describe('Litres, exact decimal as text');
const catalyst = z.enum(['KOH', 'NaOH']);

export const tankSummarySchema = z
  .object({
    onHandLiters: litres(),
    reservedLiters: litres(),
    heldLiters: litres().describe(
      'Held while a batch in it is under review (reserved fuel included): on hand, not for drawing',
    ),
    availableLiters: litres(),
    capacityLiters: litres(),
    avgCostCentsPerGallon: num().nullable(),
    tanks: int(),
  })
  .meta({ id: 'OverviewTank' });

export const priceSummarySchema = z
  .object({
    kind: z.enum(['fixed', 'cost-plus-amount', 'cost-plus-percent']),
    centsPerGallon: num().describe(
      'Off-road/heating price per gallon (base + surcharge); road adds roadTaxCentsPerGallon',
    ),
    roadTaxCentsPerGallon: num(),
  })
  .meta({ id: 'OverviewPrice' });

export const monthVolumeSchema = z
  .object({ month: str().describe('YYYY-MM'), releasedLiters: num(), drawnLiters: num() })
  .meta({ id: 'MonthVolume' });

/** A batch's quality in the one wording: "Meets …", "Fails: …" or "Screened — n of m …". */
export const qualityWordingSchema = z.object({ text: str(), kind: z.enum(['meets', 'fails', 'screened']) });

export const brewerSectionSchema = z.object({
  inProgress: z.array(
    z.object({
      id: int(),
      number: int(),
      status: str(),
      oilLiters: num(),
      since: date(),
      quality: qualityWordingSchema.nullable(),
    }),
  ),
  recentReleased: z.array(
    z.object({ id: int(), number: int(), releasedAt: date(), releasedLiters: num(), quality: qualityWordingSchema }),
  ),
  nextPlanned: z.object({ id: int(), number: int(), batchDate: day(), oilLiters: num(), catalyst }).nullable(),
  stock: z.array(
    z.object({
      kind: z.enum(['methanol', 'KOH', 'NaOH']),
      unit: z.enum(['L', 'g']),
      available: num(),
      need: num(),
      low: z.boolean(),
    }),
  ),
});

export const treasurerSectionSchema = z.object({
  period: str().describe("YYYY-MM in the co-op's time zone"),
  invoicedCents: int(),
  paidCents: int(),
  outstandingCents: int(),
  invoices: int(),
  drafts: int(),
  unmatchedPayments: int(),
  unmatchedCents: int(),
});

/** One released batch's cost per US gallon, split by kind (cents, may carry fractions). */
export const batchCostSchema = z
  .object({
    number: int(),
    releasedOn: day(),
    releasedLiters: num(),
    methanol: num(),
    catalyst: num(),
    energy: num(),
    feedstock: num(),
    other: num(),
    totalCentsPerGallon: num(),
  })
  .meta({ id: 'BatchCost' });

export const overviewSchema = z
  .object({
    role,
    tank: tankSummarySchema,
    price: priceSummarySchema.nullable(),
    volumes: z.array(monthVolumeSchema),
    tankLevel: z.array(z.object({ day: day(), onHandLiters: num() })),
    member: z.object({
      openReservations: z.array(z.object({ id: int(), tankName: str(), quantityLiters: litres(), windowEnd: str() })),
    }),
    account: z
      .object({ outstandingCents: int(), creditCents: int(), unallocatedCents: int() })
      .describe('My own account'),
    brewer: brewerSectionSchema.optional().describe('Brewers and admins'),
    treasurer: treasurerSectionSchema.optional().describe('Treasurers and admins'),
    batchCosts: z
      .array(batchCostSchema)
      .optional()
      .describe(
        'Brewers, treasurers and admins: the last finished batches (released, or imported with costs), oldest first',
      ),
    balances: z
      .object({
        topOwing: z.array(z.object({ membershipId: int(), name: str(), outstandingCents: int() })),
        membersOwing: int(),
        totalOutstandingCents: int(),
      })
      .optional()
      .describe('Treasurers and admins: who owes the most'),
    admin: z
      .object({
        pendingInvitations: int(),
        notSentInvitations: int(),
        recentEvents: z.array(z.object({ at: date(), who: str().nullable(), action: str() })),
      })
      .optional(),
  })
  .meta({ id: 'Overview' });
