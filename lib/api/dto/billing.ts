import { z } from 'zod';
import { date, day, int, num, str } from './common';

// Billing as the API sends it. lib/billing's DTO types are inferred from these (one definition).

const period = () => str().describe('YYYY-MM');

export const invoiceSummarySchema = z
  .object({
    id: int(),
    kind: z.enum(['invoice', 'credit-note']),
    number: int().nullable(),
    label: str().nullable().describe('INV-000012, CN-000013, or null for a draft'),
    status: z.enum(['draft', 'issued', 'partly-paid', 'paid', 'void']),
    period: period(),
    memberId: int(),
    memberName: str(),
    memberEmail: str(),
    totalCents: int(),
    paidCents: int(),
    outstandingCents: int(),
    issuedAt: date().nullable(),
    dueOn: day().nullable(),
    overdue: z.boolean(),
    emailStatus: z.enum(['not-sent', 'queued', 'sending', 'sent', 'failed']),
    creditNoteForId: int().nullable(),
    creditNoteId: int().nullable(),
  })
  .meta({ id: 'InvoiceSummary' });

export const invoiceLineSchema = z
  .object({
    id: str(),
    kind: z.enum(['draw', 'draw-reversal', 'dues', 'surcharge', 'road-tax', 'adjustment', 'credit']),
    description: str(),
    occurredAt: date().nullable(),
    quantityLiters: num().nullable().describe('Negative on reversals'),
    unitPriceCentsPerGallon: num().nullable(),
    amountCents: int(),
  })
  .meta({ id: 'InvoiceLine' });

export const refundSchema = z
  .object({
    id: int(),
    amountCents: int(),
    status: z.enum(['pending', 'succeeded', 'failed']),
    reason: str(),
    refundedOn: day(),
    failureMessage: str().nullable(),
  })
  .meta({ id: 'Refund' });

export const paymentSchema = z
  .object({
    id: int(),
    method: z.enum(['card', 'cash', 'cheque']),
    memberId: int(),
    memberName: str(),
    invoiceId: int().nullable(),
    invoiceLabel: str().nullable(),
    invoicePeriod: period().nullable(),
    amountCents: int(),
    appliedCents: int(),
    creditedCents: int(),
    unallocatedCents: int(),
    refundedCents: int(),
    refundableCents: int().describe("The unmatched part plus this payment's share of the member's credit"),
    receivedOn: day(),
    period: period(),
    reference: str().nullable(),
    note: str().nullable(),
    periodClosed: z.boolean(),
    refunds: z.array(refundSchema),
  })
  .meta({ id: 'Payment' });

const ref = z.object({ id: int(), label: str().nullable() });

export const invoiceDetailSchema = invoiceSummarySchema
  .extend({
    lines: z.array(invoiceLineSchema),
    payments: z.array(paymentSchema),
    pendingAttempt: z.object({ id: int(), createdAt: date() }).nullable(),
    lastFailedAttempt: z.object({ message: str(), at: date() }).nullable(),
    voidReason: str().nullable(),
    voidedAt: date().nullable(),
    creditNote: ref.nullable(),
    original: ref.nullable(),
    periodClosed: z.boolean(),
    emailedAt: date().nullable(),
    emailAttempts: int(),
  })
  .meta({ id: 'InvoiceDetail' });

export const balanceSchema = z
  .object({
    outstandingCents: int().describe('Unpaid amounts of issued invoices'),
    creditCents: int().describe('Credit held for the member, applied to the next invoice'),
    unallocatedCents: int().describe('Payments received but not matched to an invoice yet'),
  })
  .meta({ id: 'MemberBalance' });

export const runSchema = z
  .object({
    id: int(),
    period: period(),
    status: z.enum(['running', 'completed', 'failed', 'abandoned']),
    totalMembers: int(),
    doneMembers: int(),
    drafts: int(),
    limitedToMembers: int().nullable(),
    error: str().nullable(),
    startedAt: date(),
    finishedAt: date().nullable(),
  })
  .meta({ id: 'BillingRun' });

export const adjustmentSchema = z
  .object({
    id: int(),
    memberId: int(),
    memberName: str(),
    amountCents: int(),
    description: str(),
    period: period().describe("Billed on the member's first invoice for this month or later"),
    billedOn: period().nullable().describe('The month of the invoice that billed it'),
  })
  .meta({ id: 'Adjustment' });

export const periodOverviewSchema = z
  .object({
    period: period(),
    closed: z.boolean(),
    closedAt: date().nullable(),
    run: runSchema.nullable(),
    counts: z.object({ draft: int(), issued: int(), partlyPaid: int(), paid: int(), void: int(), creditNotes: int() }),
    email: z.object({ queued: int(), sending: int(), sent: int(), failed: int(), notSent: int() }),
    totals: z.object({ invoicedCents: int(), paidCents: int(), outstandingCents: int(), draftCents: int() }),
  })
  .meta({ id: 'PeriodOverview' });

/** One identity that must hold in a month's books, both sides shown so a difference is visible. */
export const reconciliationCheckSchema = z
  .object({ label: str(), leftCents: int(), rightCents: int(), ok: z.boolean() })
  .meta({ id: 'ReconciliationCheck' });

/** A month's books side by side (lib/billing/reconciliation.ts's Reconciliation is inferred from it). */
export const reconciliationSchema = z
  .object({
    period: period(),
    closed: z.boolean(),
    closedAt: date().nullable(),
    closedBy: str().nullable(),
    monthOver: z.boolean(),
    invoices: z.object({
      rows: z.array(invoiceSummarySchema),
      issuedCount: int(),
      draftCount: int(),
      invoicedCents: int(),
      creditNotesCents: int(),
      paidCents: int(),
      outstandingCents: int(),
      unpaidCount: int(),
    }),
    payments: z.object({
      receivedCents: int(),
      byMethod: z.object({ card: int(), cash: int(), cheque: int() }),
      appliedCents: int(),
      creditedCents: int(),
      unallocatedCents: int(),
      refundedCents: int(),
      appliedElsewhereCents: int().describe('Received this month, applied to invoices of other months'),
      unmatched: z.array(paymentSchema),
    }),
    pendingCardAttempts: int(),
    pendingRefunds: int(),
    unbilledDraws: z.object({ count: int(), totalCents: int() }),
    checks: z.array(reconciliationCheckSchema),
    blockers: z.array(str()).describe('Why the month cannot be closed yet (empty when it can)'),
  })
  .meta({
    id: 'Reconciliation',
    description:
      'Invoices due / paid / outstanding, money received and where it went, unmatched payments, checks, and what blocks closing.',
  });

// Small answers of billing's writes (lib/billing issue, void, card payment, the provider's webhook).
export const invoicesIssuedSchema = z.object({
  issued: int(),
  firstNumber: str().nullable().describe('The first invoice number given; null when none was issued'),
  lastNumber: str().nullable(),
});
export const emailsQueuedSchema = z.object({ queued: int().describe('E-mails queued for the worker') });
export const invoiceVoidedSchema = z.object({
  invoiceId: int(),
  creditNoteId: int(),
  creditNoteLabel: str().nullable(),
});
export const cardPaidSchema = z.object({ status: z.literal('succeeded'), invoice: invoiceDetailSchema });
export const webhookReceivedSchema = z.object({
  received: z.literal(true),
  duplicate: z.boolean().describe('The event id was seen before: acknowledged, not applied again'),
  outcome: str().describe('What applying it did (applied, ignored, duplicate …), as stored with the event'),
});
