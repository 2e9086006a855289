import type { InvoiceStatus } from '@/models/Invoice';

/** Invoices that still owe money. */
export const OPEN_STATUSES: InvoiceStatus[] = ['issued', 'partly-paid'];
/** An invoice's unpaid amount (never below zero), for SQL aggregates over `invoices`. */
export const OUTSTANDING_SQL = 'GREATEST(total_cents - paid_cents, 0)';

/** Words for statuses, shared by pages, PDFs and CSVs (pure). */
export const INVOICE_STATUS_LABEL: Record<string, string> = {
  draft: 'Draft',
  issued: 'Unpaid',
  'partly-paid': 'Partly paid',
  paid: 'Paid',
  void: 'Void',
};

export const EMAIL_STATUS_LABEL: Record<string, string> = {
  'not-sent': 'Not sent',
  queued: 'Queued',
  sending: 'Sending',
  sent: 'Sent',
  failed: 'Not delivered',
};

export const METHOD_LABEL: Record<string, string> = { card: 'Card', cash: 'Cash', cheque: 'Cheque' };

export const LINE_KIND_LABEL: Record<string, string> = {
  draw: 'Fuel',
  'draw-reversal': 'Fuel (reversal)',
  dues: 'Dues',
  surcharge: 'Surcharge',
  'road-tax': 'Road-fuel tax',
  adjustment: 'Adjustment',
  credit: 'Credit',
};
