import { z } from 'zod';
import { DECLARED_USES } from '@/models/vocabulary';
import { date, int, num, str, units } from './common';

// The tank, pricing, reservations and draws as the API sends them. The services' DTO types
// (lib/tank, lib/tank/reservations, lib/tank/draws, lib/tank/pricing-policy) are inferred from these: one
// definition, so the contract, the server and the typed client cannot drift apart.

export const tankMixing = z.enum(['mixed', 'fifo']);

export const movementKind = z.enum([
  'release',
  'draw',
  'draw-reversal',
  'dip-adjustment',
  'transfer-in',
  'transfer-out',
  'opening',
  'disposal',
  'retreat',
]);

export const tankSchema = z
  .object({
    id: int(),
    name: str(),
    active: z.boolean(),
    units,
    capacityLiters: num(),
    onHandLiters: num(),
    reservedLiters: num().describe('Open reservations whose window has not ended.'),
    heldLiters: num().describe('Held while a batch in the tank is under review (not reservable, drawable or movable).'),
    availableLiters: num().describe('On hand − reserved − held, never below zero.'),
    capacity: num().describe("In the co-op's unit (US gallons or litres), 3 decimals; available is rounded down."),
    onHand: num(),
    reserved: num(),
    held: num(),
    available: num(),
    mixing: tankMixing.describe('mixed: a draw takes every batch in proportion; fifo: oldest fuel first.'),
    valueCents: int().describe('Stock value at moving weighted-average cost.'),
    avgCostCentsPerGallon: num().nullable().describe('value ÷ on hand per US gallon (2 decimals), null when empty.'),
    avgCostCentsPerUnit: num().nullable().describe('The same per co-op unit, null when empty.'),
    lastDipAt: date().nullable(),
  })
  .meta({ id: 'Tank' });

export const dipResultSchema = z.object({
  tank: tankSchema,
  dipReadingId: int(),
  differenceLiters: num().describe('Measured − book; 0 when the reading matched.'),
  difference: num(),
  movementId: str().nullable(),
});

export const movementSchema = z
  .object({
    id: str(),
    kind: movementKind,
    quantityLiters: num(),
    quantity: num().describe("Signed, in the co-op's unit."),
    valueCents: int(),
    onHandAfterLiters: num(),
    onHandAfter: num(),
    valueAfterCents: int(),
    reason: str().nullable(),
    batchId: int().nullable(),
    drawId: int().nullable(),
    memberName: str().nullable(),
    transferTankName: str().nullable(),
    byName: str().nullable(),
    occurredAt: date(),
  })
  .meta({ id: 'TankMovement' });

/** Who took or holds fuel from which tank, and how much: shared by reservations and draws. */
const memberTankFields = {
  id: int(),
  tankId: int(),
  tankName: str(),
  membershipId: int(),
  memberName: str(),
  quantityLiters: num(),
};

export const reservationSchema = z
  .object({
    ...memberTankFields,
    quantity: num().describe("In the co-op's unit."),
    windowStart: date(),
    windowEnd: date(),
    status: z.enum(['open', 'drawn', 'cancelled', 'expired']),
    closedAt: date().nullable(),
    createdAt: date(),
    drawId: int().nullable().describe('The draw that closed it, when drawn.'),
  })
  .meta({ id: 'Reservation' });

export const drawBatchSchema = z.object({
  batchId: int().nullable(),
  batchNumber: int().nullable(),
  ml: num(),
  quantity: num(),
});

export const drawSchema = z
  .object({
    ...memberTankFields,
    reservationId: int().nullable(),
    quantity: num().describe("In the co-op's unit; negative on a reversal."),
    meterBefore: num().nullable(),
    meterAfter: num().nullable(),
    declaredUse: z.enum(DECLARED_USES),
    vehicle: str().nullable(),
    unitPriceCentsPerGallon: num(),
    surchargeCentsPerGallon: num(),
    roadTaxCentsPerGallon: num(),
    fuelCents: int(),
    surchargeCents: int(),
    taxCents: int(),
    totalCents: int(),
    costValueCents: int(),
    reversesDrawId: int().nullable(),
    reversedByDrawId: int().nullable(),
    reason: str().nullable(),
    recordedBy: str().nullable(),
    occurredAt: date(),
    status: z.enum(['recorded', 'reversed', 'reversal']),
    batches: z
      .array(drawBatchSchema)
      .describe("The batches the fuel came from, in the co-op's unit; batch null = unattributed."),
  })
  .meta({ id: 'Draw' });

const rates = { surchargeCentsPerGallon: num().optional(), roadTaxCentsPerGallon: num().optional() };
/** How the co-op sets the member price per gallon (lib/pricing's PricingPolicy). */
export const pricingPolicySchema = z.union([
  z.object({ kind: z.literal('fixed'), priceCents: num(), ...rates }),
  z.object({ kind: z.literal('cost-plus-amount'), marginCents: num(), ...rates }),
  z.object({ kind: z.literal('cost-plus-percent'), marginPct: num(), ...rates }),
]);

export const pricePolicySchema = z
  .object({
    id: int(),
    kind: z.enum(['fixed', 'cost-plus-amount', 'cost-plus-percent']),
    policy: pricingPolicySchema.describe("In the co-op's units (cents per gallon or per litre)."),
    stored: z
      .object({
        priceCentsPerGallon: num().nullable(),
        marginCentsPerGallon: num().nullable(),
        marginPct: num().nullable(),
        surchargeCentsPerGallon: num(),
        roadTaxCentsPerGallon: num(),
      })
      .describe('As stored: cents per US gallon.'),
    description: str(),
    effectiveFrom: date(),
    createdBy: str().nullable(),
    createdAt: date(),
    status: z.enum(['in-force', 'scheduled', 'past']),
  })
  .meta({ id: 'PricePolicy' });
