import { z } from 'zod';
import { DECLARED_USES } from '@/lib/pricing';
import { idSchema as commonIdSchema } from './common';
import { listQuerySchema } from './list';

// Tank, pricing, reservation and draw schemas, shared by the forms and the route handlers.
// Volumes are in the co-op's unit (US gallons or litres) and come back as whole thousandths of
// that unit ("milli-units"); money amounts come back as whole cents; fractional cent rates as
// thousandths of a cent. Nothing here goes through a float to decide a value.

/** A decimal typed in a form or sent as a JSON number, with at most `decimals` places → scaled integer. */
function scaledDecimal(opts: { decimals: number; what: string; positive?: boolean; max: number }) {
  const { decimals, what, positive, max } = opts;
  const f = 10 ** decimals;
  return z.union([z.string(), z.number()], { error: `Enter ${what}.` }).transform((v, ctx) => {
    const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : v.trim().replace(/,/g, '');
    if (s === '') {
      ctx.addIssue({ code: 'custom', message: `Enter ${what}.` });
      return z.NEVER;
    }
    if (/^-/.test(s) && /^-\d*\.?\d+$/.test(s)) {
      ctx.addIssue({
        code: 'custom',
        message: positive ? `Enter ${what} greater than zero.` : `Enter ${what} of zero or more.`,
      });
      return z.NEVER;
    }
    const m = /^(\d+)(?:\.(\d*))?$/.exec(s) ?? /^()\.(\d+)$/.exec(s);
    if (!m) {
      ctx.addIssue({ code: 'custom', message: `Enter ${what} as a number, such as 12.5.` });
      return z.NEVER;
    }
    const frac = m[2] ?? '';
    if (frac.length > decimals) {
      ctx.addIssue({ code: 'custom', message: `Use at most ${decimals} decimal${decimals === 1 ? '' : 's'}.` });
      return z.NEVER;
    }
    const scaled = Number(m[1] || '0') * f + Number(frac.padEnd(decimals, '0') || '0');
    if (positive && scaled === 0) {
      ctx.addIssue({ code: 'custom', message: `Enter ${what} greater than zero.` });
      return z.NEVER;
    }
    if (scaled > max * f) {
      ctx.addIssue({ code: 'custom', message: `That is more than ${max.toLocaleString('en-US')}.` });
      return z.NEVER;
    }
    return scaled;
  });
}

/** A volume in the co-op's unit, > 0, at most 3 decimals → thousandths of the unit. */
export const quantitySchema = scaledDecimal({ decimals: 3, what: 'a quantity', positive: true, max: 1_000_000 });
/** A volume in the co-op's unit, ≥ 0 (a dip reading, a meter register) → thousandths of the unit. */
export const volumeReadingSchema = scaledDecimal({ decimals: 3, what: 'a reading', max: 100_000_000 });
/** Money per co-op unit in currency units with at most 2 decimals ("3.10") → whole cents. */
export const moneyPerUnitSchema = scaledDecimal({ decimals: 2, what: 'an amount', max: 100_000 });
/** A rate in cents per co-op unit with at most 3 decimals ("24.4") → thousandths of a cent. */
export const centsRateSchema = scaledDecimal({ decimals: 3, what: 'a rate in cents', max: 1_000_000 });
/** A percentage with at most 2 decimals → hundredths of a percent. */
export const percentSchema = scaledDecimal({ decimals: 2, what: 'a percentage', max: 1000 });

const idSchema = (what: string) => commonIdSchema(`Choose ${what}.`);
const reasonSchema = z
  .string({ error: 'Give a reason.' })
  .trim()
  .min(3, 'Give a reason (at least 3 characters).')
  .max(500, 'At most 500 characters.');
const tankNameSchema = z
  .string({ error: 'Enter a name.' })
  .trim()
  .min(1, 'Enter a name.')
  .max(80, 'At most 80 characters.');
const instantSchema = z.iso.datetime({ offset: true, local: true, error: 'Enter a date and time.' });
const toBool = z.union([z.boolean(), z.enum(['true', 'false']).transform((v) => v === 'true')], {
  error: 'Choose yes or no.',
});

export const tankCreateSchema = z.strictObject({ name: tankNameSchema, capacity: quantitySchema });

export const tankUpdateSchema = z
  .strictObject({
    name: tankNameSchema.optional(),
    capacity: quantitySchema.optional(),
    active: toBool.optional(),
    /** 'mixed': stirred or recirculated, a draw takes every batch in proportion; 'fifo': the oldest fuel leaves first. */
    mixing: z.enum(['mixed', 'fifo'], { error: 'Choose well mixed or first in, first out.' }).optional(),
  })
  .refine((v) => v.name !== undefined || v.capacity !== undefined || v.active !== undefined || v.mixing !== undefined, {
    message: 'Change the name, the capacity, the mixing model or whether the tank is in use.',
    path: ['_form'],
  });

export const dipCreateSchema = z.strictObject({
  measured: volumeReadingSchema,
  reason: z.string().trim().max(500, 'At most 500 characters.').optional(),
  /** Value of a gain per co-op unit (e.g. an opening balance); default the tank's average cost. */
  unitCost: moneyPerUnitSchema.optional(),
});

export const transferCreateSchema = z
  .strictObject({
    fromTankId: idSchema('the tank to move fuel from'),
    toTankId: idSchema('the tank to move fuel into'),
    quantity: quantitySchema,
    reason: z.string().trim().max(500, 'At most 500 characters.').optional(),
  })
  .refine((v) => v.fromTankId !== v.toTankId, { message: 'Choose two different tanks.', path: ['toTankId'] });

export const PRICING_KINDS = ['fixed', 'cost-plus-amount', 'cost-plus-percent'] as const;

export const pricingPolicyCreateSchema = z
  .strictObject({
    kind: z.enum(PRICING_KINDS, { error: 'Choose how the price is set.' }),
    price: moneyPerUnitSchema.optional(),
    margin: moneyPerUnitSchema.optional(),
    marginPct: percentSchema.optional(),
    surchargeCents: centsRateSchema.optional(),
    roadTaxCents: centsRateSchema.optional(),
    effectiveFrom: instantSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.kind === 'fixed' && v.price === undefined)
      ctx.addIssue({ code: 'custom', path: ['price'], message: 'Enter the price per unit.' });
    if (v.kind === 'cost-plus-amount' && v.margin === undefined)
      ctx.addIssue({ code: 'custom', path: ['margin'], message: 'Enter the amount added to the average cost.' });
    if (v.kind === 'cost-plus-percent' && v.marginPct === undefined)
      ctx.addIssue({ code: 'custom', path: ['marginPct'], message: 'Enter the percentage added to the average cost.' });
  });

/** A member reserves for themself: no membershipId here (a smuggled one is a 422). */
export const reservationCreateSchema = z.strictObject({
  tankId: idSchema('a tank'),
  quantity: quantitySchema,
  windowStart: z.string({ error: 'Enter a start date.' }).trim().min(1, 'Enter a start date.').max(40),
  windowEnd: z.string({ error: 'Enter an end date.' }).trim().min(1, 'Enter an end date.').max(40),
  /** Named only to answer clearly: any value here is refused (members reserve for themselves). */
  membershipId: z.never({ error: 'You can reserve only for yourself.' }).optional(),
});

export const RESERVATION_STATUSES = ['open', 'drawn', 'cancelled', 'expired'] as const;
const dateFilter = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date such as 2026-12-03.')
  .optional();

export const reservationListSchema = listQuerySchema(
  ['created_at', 'window_end', 'quantity', 'status'],
  'created_at',
).extend({
  status: z.enum(RESERVATION_STATUSES, { error: `Status is one of: ${RESERVATION_STATUSES.join(', ')}.` }).optional(),
  membershipId: idSchema('a member').optional(),
  tankId: idSchema('a tank').optional(),
  from: dateFilter,
  to: dateFilter,
});

export const drawCreateSchema = z
  .strictObject({
    membershipId: idSchema('the member').optional(),
    tankId: idSchema('a tank'),
    reservationId: idSchema('a reservation').optional(),
    quantity: quantitySchema.optional(),
    meterBefore: volumeReadingSchema.optional(),
    meterAfter: volumeReadingSchema.optional(),
    declaredUse: z.enum(DECLARED_USES as unknown as ['road', 'off-road', 'heating'], {
      error: 'Choose road, off-road or heating.',
    }),
    vehicle: z.string().trim().max(120, 'At most 120 characters.').optional(),
    occurredAt: instantSchema.optional(),
  })
  .superRefine((v, ctx) => {
    const meters = v.meterBefore !== undefined || v.meterAfter !== undefined;
    if (meters && (v.meterBefore === undefined || v.meterAfter === undefined)) {
      ctx.addIssue({
        code: 'custom',
        path: [v.meterBefore === undefined ? 'meterBefore' : 'meterAfter'],
        message: 'Enter both meter readings, or only the quantity.',
      });
      return;
    }
    if (!meters && v.quantity === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['quantity'],
        message: 'Enter the quantity drawn, or the meter readings before and after.',
      });
      return;
    }
    if (meters) {
      const diff = v.meterAfter! - v.meterBefore!;
      if (diff < 0)
        ctx.addIssue({
          code: 'custom',
          path: ['meterAfter'],
          message: 'The meter reading after the draw is lower than before; readings cannot go backwards.',
        });
      else if (diff === 0)
        ctx.addIssue({
          code: 'custom',
          path: ['meterAfter'],
          message: 'The readings are the same, so nothing was drawn.',
        });
      else if (v.quantity !== undefined && v.quantity !== diff)
        ctx.addIssue({
          code: 'custom',
          path: ['quantity'],
          message: 'The quantity does not match the meter readings; give one or the other.',
        });
    }
  });

export const drawReverseSchema = z.strictObject({ reason: reasonSchema });

export const DRAW_STATUSES = ['recorded', 'reversed', 'reversal'] as const;

export const drawListSchema = listQuerySchema(['occurred_at', 'quantity', 'total'], 'occurred_at').extend({
  membershipId: idSchema('a member').optional(),
  tankId: idSchema('a tank').optional(),
  status: z.enum(DRAW_STATUSES, { error: `Status is one of: ${DRAW_STATUSES.join(', ')}.` }).optional(),
  from: dateFilter,
  to: dateFilter,
});

export const MOVEMENT_KINDS = [
  'release',
  'draw',
  'draw-reversal',
  'dip-adjustment',
  'transfer-in',
  'transfer-out',
  'opening',
] as const;

export const movementListSchema = listQuerySchema(['recorded', 'occurred_at', 'quantity', 'kind'], 'recorded').extend({
  kind: z.enum(MOVEMENT_KINDS, { error: `Kind is one of: ${MOVEMENT_KINDS.join(', ')}.` }).optional(),
});

/** Thousandths of a unit of the draw: the quantity, or the meter difference. */
export function drawQuantityMilli(v: z.infer<typeof drawCreateSchema>): number {
  return v.meterBefore !== undefined && v.meterAfter !== undefined
    ? v.meterAfter - v.meterBefore
    : (v.quantity as number);
}
