import { z } from 'zod';
import { ROLES } from '@/lib/auth/roles';

// Response bodies as the API sends them (JSON after serialisation: dates are ISO strings, money
// whole cents, volumes in litres and in the co-op's unit). Most objects are "loose" (fields not
// listed may appear); a DTO listed in full is a z.object, so an undeclared field fails the tests'
// response checks (tests/support/contract.ts) and the typed client gets its exact shape.

const int = () => z.number().int();
const num = () => z.number();
const str = () => z.string();
const date = () => z.string().describe('ISO 8601 date-time');
const day = () => z.string().describe('YYYY-MM-DD');
const nullable = <T extends z.ZodType>(t: T) => t.nullable();
export const role = z.enum(ROLES);
const membershipStatus = z.enum(['active', 'suspended']);

/** Every error answer: a sentence a person understands, and for bad input each field's reasons. */
export const errorSchema = z
  .looseObject({
    error: str().describe('What went wrong, in a sentence'),
    fields: z.record(z.string(), z.array(z.string())).optional().describe('Field → reasons (422)'),
    code: str().optional().describe('A stable code for some errors (database-unavailable, locked, duplicate …)'),
    requestId: str().optional().describe('Quote this when reporting a 500'),
    retryAfter: num().optional(),
  })
  .meta({ id: 'Error' });

/** A page of rows: `{ rows, total, page, pageSize }`. */
export const pageOf = <T extends z.ZodType>(row: T) => z.looseObject({ rows: z.array(row), total: int(), page: int(), pageSize: int() });

/** A page of items (tank, reservations, draws): `{ items, total, page, pageSize }`. */
export const itemsOf = <T extends z.ZodType>(item: T) => z.looseObject({ items: z.array(item), total: int(), page: int(), pageSize: int() });

export const okSchema = z.looseObject({});

export const myCoopSchema = z.looseObject({ slug: str(), name: str(), role, status: membershipStatus });

export const profileSchema = z
  .looseObject({
    id: int(),
    name: str(),
    email: str(),
    pendingEmail: nullable(str()),
    coops: z.array(myCoopSchema.extend({ joinedAt: date(), timezone: str() })),
  })
  .meta({ id: 'Profile' });

export const memberSchema = z
  .looseObject({ id: int(), userId: int(), role, status: membershipStatus, name: str(), email: str(), joinedAt: date(), isYou: z.boolean() })
  .meta({ id: 'Member' });

export const invitationSchema = z
  .looseObject({ id: int(), email: str(), role, delivery: str(), expiresAt: date().optional() })
  .meta({ id: 'Invitation' });

export const tankSchema = z
  .object({
    id: int(),
    name: str(),
    active: z.boolean(),
    units: z.enum(['us', 'metric']),
    capacityLiters: num(),
    onHandLiters: num(),
    reservedLiters: num(),
    heldLiters: num().describe('Held while a batch in the tank is under review (not reservable, drawable or movable).'),
    availableLiters: num(),
    capacity: num(),
    onHand: num(),
    reserved: num(),
    held: num(),
    available: num(),
    mixing: z.enum(['mixed', 'fifo']).describe('mixed: a draw takes every batch in proportion; fifo: oldest fuel first.'),
    valueCents: int(),
    avgCostCentsPerGallon: nullable(num()),
    avgCostCentsPerUnit: nullable(num()),
    lastDipAt: nullable(date()),
  })
  .meta({ id: 'Tank' });

export const movementSchema = z
  .looseObject({ id: str(), kind: str(), quantityLiters: num(), quantity: num(), valueCents: int(), onHandAfterLiters: num(), onHandAfter: num(), occurredAt: date() })
  .meta({ id: 'TankMovement' });

export const reservationSchema = z
  .looseObject({
    id: int(),
    tankId: int(),
    tankName: str(),
    membershipId: int(),
    memberName: str(),
    quantityLiters: num(),
    quantity: num(),
    windowStart: date(),
    windowEnd: date(),
    status: z.enum(['open', 'drawn', 'cancelled', 'expired']),
    closedAt: nullable(date()),
    createdAt: date(),
    drawId: nullable(int()),
  })
  .meta({ id: 'Reservation' });

export const drawSchema = z
  .looseObject({
    id: int(),
    tankId: int(),
    tankName: str(),
    membershipId: int(),
    memberName: str(),
    reservationId: nullable(int()),
    quantityLiters: num(),
    quantity: num(),
    declaredUse: str(),
    vehicle: nullable(str()),
    unitPriceCentsPerGallon: num(),
    fuelCents: int(),
    surchargeCents: int(),
    taxCents: int(),
    totalCents: int(),
    reversesDrawId: nullable(int()),
    reversedByDrawId: nullable(int()),
    occurredAt: date(),
    status: z.enum(['recorded', 'reversed', 'reversal']),
  })
  .meta({ id: 'Draw' });

export const pricePolicySchema = z
  .looseObject({ id: int(), kind: z.enum(['fixed', 'cost-plus-amount', 'cost-plus-percent']), description: str(), effectiveFrom: date(), createdAt: date(), status: z.enum(['in-force', 'scheduled', 'past']) })
  .meta({ id: 'PricePolicy' });

export const chemicalLotSchema = z
  .looseObject({ id: int(), kind: str(), supplier: str(), receivedOn: day(), unit: z.enum(['L', 'g']), quantity: num(), remaining: num(), totalCostCents: int(), purityPct: nullable(num()), hasSafetyDataSheet: z.boolean() })
  .meta({ id: 'ChemicalLot' });

export const oilLotSchema = z
  .looseObject({ id: int(), collectedFrom: str(), collectedOn: day(), volumeLiters: num(), usedLiters: num(), remainingLiters: num(), costCents: int(), titrationMl: nullable(num()) })
  .meta({ id: 'OilLot' });

export const batchSchema = z.looseObject({ id: int(), number: int(), status: str() }).meta({ id: 'Batch', description: 'A batch: recipe, steps, temperatures, quality, costs (brewers and admins see every field; others a released batch\'s summary).' });

export const batchRowSchema = z.looseObject({ id: int(), number: int(), status: str(), batchDate: day(), oilLiters: num(), releasedLiters: nullable(num()) }).meta({ id: 'BatchRow' });

export const temperatureSchema = z.looseObject({ id: z.union([int(), str()]) }).meta({ id: 'Temperature' });

const invoiceStatus = str().describe('draft, issued, paid, void …');
export const invoiceSummarySchema = z
  .looseObject({
    id: int(),
    kind: str(),
    number: nullable(int()),
    label: nullable(str()),
    status: invoiceStatus,
    period: str(),
    memberId: int(),
    memberName: str(),
    totalCents: int(),
    paidCents: int(),
    outstandingCents: int(),
    issuedAt: nullable(date()),
    dueOn: nullable(str()),
    overdue: z.boolean(),
    emailStatus: str(),
  })
  .meta({ id: 'InvoiceSummary' });

export const refundSchema = z.looseObject({ id: int(), amountCents: int(), status: z.enum(['pending', 'succeeded', 'failed']), reason: str(), refundedOn: str() }).meta({ id: 'Refund' });

export const paymentSchema = z
  .looseObject({
    id: int(),
    method: z.enum(['card', 'cash', 'cheque']),
    memberId: int(),
    memberName: str(),
    invoiceId: nullable(int()),
    amountCents: int(),
    appliedCents: int(),
    creditedCents: int(),
    unallocatedCents: int(),
    refundedCents: int(),
    refundableCents: int(),
    receivedOn: str(),
    period: str(),
    refunds: z.array(refundSchema),
  })
  .meta({ id: 'Payment' });

export const invoiceDetailSchema = invoiceSummarySchema
  .extend({
    lines: z.array(z.looseObject({ id: str(), kind: str(), description: str(), amountCents: int() })),
    payments: z.array(paymentSchema),
    periodClosed: z.boolean(),
  })
  .meta({ id: 'InvoiceDetail' });

export const balanceSchema = z.looseObject({ outstandingCents: int(), creditCents: int(), unallocatedCents: int() }).meta({ id: 'MemberBalance' });

export const runSchema = z
  .looseObject({ id: int(), period: str(), status: z.enum(['running', 'completed', 'failed', 'abandoned']), totalMembers: int(), doneMembers: int(), drafts: int(), error: nullable(str()), startedAt: date(), finishedAt: nullable(date()) })
  .meta({ id: 'BillingRun' });

export const adjustmentSchema = z
  .looseObject({ id: int(), memberId: int(), memberName: str(), amountCents: int(), description: str(), period: str(), billedOn: nullable(str()) })
  .meta({ id: 'Adjustment' });

export const reconciliationSchema = z.looseObject({}).meta({ id: 'Reconciliation', description: 'Invoices due / paid / outstanding, money received and where it went, unmatched payments, checks, and what blocks closing.' });

export const coopSettingsSchema = z
  .looseObject({ name: str(), slug: str(), units: z.enum(['us', 'metric']), timezone: str(), currency: str() })
  .meta({ id: 'CoopSettings' });

export const auditEventSchema = z.looseObject({ id: z.union([int(), str()]), action: str(), entityType: str() }).meta({ id: 'AuditEvent' });

export const apiTokenSchema = z
  .looseObject({
    id: int(),
    name: str(),
    access: z.enum(['read', 'write']),
    prefix: str().describe('The first characters of the token, to recognise it'),
    createdBy: nullable(str()),
    createdAt: date(),
    lastUsedAt: nullable(date()).describe('Recorded at most once an hour'),
    revokedAt: nullable(date()),
  })
  .meta({ id: 'ApiToken' });
