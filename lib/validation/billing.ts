import { z } from 'zod';
import { PERIOD_PATTERN } from '@/lib/billing/periods';
import { safeParseMoneyToCents } from '@/lib/money/format';
import { TEST_CARD_IDS } from '@/lib/payments/test-cards';
import { idSchema as commonIdSchema } from './common';
import { listQuerySchema } from './list';

// Billing schemas, shared by the forms (client) and the route handlers (server).

/** The largest amount one payment, refund or adjustment may carry: $999,999.99 (the payment provider's limit per charge). */
export const MAX_AMOUNT_CENTS = 99_999_999;

export const periodSchema = z.string({ error: 'Choose a month.' }).regex(PERIOD_PATTERN, 'Choose a month (YYYY-MM).');

export const dateSchema = z
  .string({ error: 'Enter a date.' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter a date (YYYY-MM-DD).')
  .refine(
    (s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s),
    'Enter a real date.',
  );

const idSchema = commonIdSchema('Choose one.');

/** Money typed as text ("12.34"): parsed to integer cents without floating point. */
function money(opts: { signed: boolean }) {
  return z.string({ error: 'Enter an amount.' }).transform((s, ctx) => {
    const r = safeParseMoneyToCents(s);
    if (!r.ok) {
      ctx.addIssue({ code: 'custom', message: r.error });
      return z.NEVER;
    }
    if (!opts.signed && r.cents <= 0) {
      ctx.addIssue({ code: 'custom', message: 'Enter an amount above zero.' });
      return z.NEVER;
    }
    if (opts.signed && r.cents === 0) {
      ctx.addIssue({ code: 'custom', message: 'Enter an amount other than zero.' });
      return z.NEVER;
    }
    if (Math.abs(r.cents) > MAX_AMOUNT_CENTS) {
      ctx.addIssue({ code: 'custom', message: 'At most 999,999.99.' });
      return z.NEVER;
    }
    return r.cents;
  });
}

export const billingRunCreateSchema = z.strictObject({
  period: periodSchema,
  /** Invoice only these members (e.g. someone leaving mid-month); everyone when absent. */
  memberIds: z.array(idSchema).min(1, 'Choose at least one member.').max(100_000).optional(),
});

export const invoicesIssueSchema = z.strictObject({});

export const periodCloseSchema = z.strictObject({
  confirm: z.literal(true, { error: 'Confirm that the month should be closed and locked.' }),
});

export const invoiceVoidSchema = z.strictObject({
  reason: z
    .string({ error: 'Say why the invoice is voided.' })
    .trim()
    .min(3, 'Say why (at least 3 characters).')
    .max(240, 'At most 240 characters.'),
});

export const paymentRecordSchema = z.strictObject({
  memberId: idSchema,
  invoiceId: idSchema.nullish(),
  method: z.enum(['cash', 'cheque'], { error: 'Choose cash or cheque.' }),
  amount: money({ signed: false }),
  receivedOn: dateSchema,
  reference: z.string().trim().max(60, 'At most 60 characters.').optional(),
  note: z.string().trim().max(240, 'At most 240 characters.').optional(),
});

export const paymentMatchSchema = z.strictObject({
  /** The payer's invoice, or null to hold the money as the member's credit. */
  invoiceId: commonIdSchema('Choose an invoice or credit.').nullable(),
});

export const refundCreateSchema = z.strictObject({
  amount: money({ signed: false }),
  reason: z
    .string({ error: 'Say why.' })
    .trim()
    .min(3, 'Say why (at least 3 characters).')
    .max(240, 'At most 240 characters.'),
});

export const adjustmentCreateSchema = z.strictObject({
  memberId: idSchema,
  amount: money({ signed: true }),
  description: z
    .string({ error: 'Describe the adjustment.' })
    .trim()
    .min(3, 'At least 3 characters.')
    .max(200, 'At most 200 characters.'),
  period: periodSchema.optional(),
});

export const cardPaySchema = z.strictObject({
  card: z.enum(TEST_CARD_IDS, { error: 'Choose one of the test cards.' }),
});

export const invoiceListQuerySchema = listQuerySchema(
  ['number', 'member', 'total', 'outstanding', 'status', 'period'] as const,
  'number',
).extend({
  period: periodSchema.optional(),
  status: z.enum(['draft', 'issued', 'partly-paid', 'paid', 'void', 'open']).optional(),
});

export const paymentListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  period: periodSchema.optional(),
  unmatched: z.enum(['1', 'true']).optional(),
});

export const exportQuerySchema = z.object({
  kind: z.enum(['invoices', 'payments', 'balances'], { error: 'Choose invoices, payments or balances.' }),
});
