import { z } from 'zod';
import {
  adjustmentCreateSchema,
  billingRunCreateSchema,
  cardPaySchema,
  exportQuerySchema,
  invoiceListQuerySchema,
  invoiceVoidSchema,
  invoicesIssueSchema,
  paymentListQuerySchema,
  paymentMatchSchema,
  paymentRecordSchema,
  periodCloseSchema,
  refundCreateSchema,
} from '@/lib/validation/billing';
import { operation } from '../operation';
import { adjustmentSchema, balanceSchema, invoiceDetailSchema, invoiceSummarySchema, pageOf, paymentSchema, periodOverviewSchema, reconciliationSchema, runSchema } from '../schemas';

// Monthly billing (treasurers and admins) and members' own invoices.

const tags = ['Billing'];
const manage = { action: 'billing:manage' } as const;
const own = { action: 'invoices:own' } as const;
const period = z.object({ period: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/).describe('YYYY-MM') });
const closed = { 409: 'The month is closed.' };
const pdf = { file: 'application/pdf' } as const;

export const operations = [
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/runs', summary: 'Build a month\'s draft invoices (in the background)', access: manage, body: billingRunCreateSchema, responses: { 202: z.object({ run: runSchema, started: z.literal(true) }), 200: z.object({ run: runSchema, started: z.literal(false) }) }, errors: closed, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/runs/[id]', summary: 'A run\'s progress', access: manage, responses: { 200: z.object({ run: runSchema }) }, tags }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/billing/periods/[period]',
    summary: 'The month at a glance',
    access: manage,
    params: period,
    responses: { 200: periodOverviewSchema },
    tags,
  }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/periods/[period]/issue', summary: 'Issue every draft of the month', access: manage, params: period, body: invoicesIssueSchema, responses: { 200: z.looseObject({ issued: z.number().int(), firstNumber: z.string().nullable(), lastNumber: z.string().nullable() }) }, errors: { 409: 'No drafts, a run is live, or the month is closed.' }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/periods/[period]/send', summary: 'E-mail the month\'s unsent invoices again', access: manage, params: period, body: invoicesIssueSchema, responses: { 202: z.looseObject({ queued: z.number().int() }) }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/periods/[period]/reconciliation', summary: 'The month\'s reconciliation', access: manage, params: period, responses: { 200: reconciliationSchema }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/periods/[period]/close', summary: 'Close and lock the month', access: manage, params: period, body: periodCloseSchema, responses: { 200: reconciliationSchema }, errors: { 409: 'It cannot be closed yet (`blockers`).' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/periods/[period]/export', summary: 'CSV for the accountant', access: manage, params: period, query: exportQuerySchema, responses: { 200: { file: 'text/csv' } }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/invoices', summary: 'Invoices and credit notes, drafts included', access: manage, query: invoiceListQuerySchema, responses: { 200: pageOf(invoiceSummarySchema) }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/invoices/[id]', summary: 'One invoice: lines, payments, card-attempt state', access: manage, responses: { 200: invoiceDetailSchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/invoices/[id]/pdf', summary: 'An invoice as a PDF (drafts marked DRAFT)', access: manage, responses: { 200: pdf }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/invoices/[id]/void', summary: 'Void an invoice with a credit note', access: manage, body: invoiceVoidSchema, responses: { 200: z.looseObject({ invoiceId: z.number().int(), creditNoteId: z.number().int(), creditNoteLabel: z.string().nullable() }) }, errors: closed, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/invoices/[id]/send', summary: 'E-mail an issued invoice again (its mail job is queued; follow `emailStatus` on the invoice)', access: manage, body: invoicesIssueSchema, responses: { 202: z.object({ emailStatus: z.literal('queued') }) }, errors: { 409: 'The e-mail is being sent right now.' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/payments', summary: 'Payments received and where each went', access: manage, query: paymentListQuerySchema, responses: { 200: pageOf(paymentSchema) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/payments', summary: 'Record a cash or cheque payment', access: manage, body: paymentRecordSchema, responses: { 201: paymentSchema }, errors: closed, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/payments/[id]/match', summary: 'Match a payment to an invoice, or hold it as credit', access: manage, body: paymentMatchSchema, responses: { 200: paymentSchema }, errors: closed, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/payments/[id]/refunds', summary: 'Refund part of a payment', access: manage, body: refundCreateSchema, responses: { 201: paymentSchema }, errors: { 409: 'More than can be refunded, or a closed month.', 503: 'The payment service is unreachable (retry is safe).' }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/refunds/[id]/retry', summary: 'Send a pending card refund again', access: manage, responses: { 200: paymentSchema }, errors: { 409: 'Not pending.' }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/billing/adjustments', summary: 'Adjustments not billed yet', access: manage, responses: { 200: z.object({ adjustments: z.array(adjustmentSchema) }) }, tags }),
  operation({ method: 'POST', path: '/api/coops/[coop]/billing/adjustments', summary: 'Add a credit or charge to a member\'s next invoice', access: manage, body: adjustmentCreateSchema, responses: { 201: adjustmentSchema }, errors: closed, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/invoices', summary: 'My issued invoices and balance', access: own, query: invoiceListQuerySchema, responses: { 200: pageOf(invoiceSummarySchema).extend({ balance: balanceSchema }) }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/invoices/[id]', summary: 'One of my invoices', access: own, responses: { 200: invoiceDetailSchema }, tags }),
  operation({ method: 'GET', path: '/api/coops/[coop]/invoices/[id]/pdf', summary: 'One of my invoices as a PDF', access: own, responses: { 200: pdf }, tags }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/invoices/[id]/pay',
    summary: 'Pay one of my invoices by card (charged at most once)',
    access: own,
    body: cardPaySchema,
    responses: { 200: z.looseObject({ status: z.literal('succeeded'), invoice: invoiceDetailSchema }) },
    errors: { 402: 'The card was declined.', 409: 'Paid already, or a payment is in progress.', 503: 'The payment service is unreachable (the invoice stays unpaid; retry is safe).' },
    tags,
  }),
  operation({ method: 'POST', path: '/api/payments/webhook', summary: 'Payment events from the payments service (signed body)', access: 'public', body: z.looseObject({}), responses: { 200: z.looseObject({ received: z.literal(true), duplicate: z.boolean(), outcome: z.string() }) }, errors: { 400: 'Bad signature.' }, tags }),
];
