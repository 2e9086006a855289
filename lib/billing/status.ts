import type { InvoiceStatus } from '@/models/Invoice';

/** Invoices that still owe money. */
export const OPEN_STATUSES: InvoiceStatus[] = ['issued', 'partly-paid'];

// SQL over `invoices`, its columns qualified by `alias` where the statement names the table.
const column = (name: string, alias?: string) => (alias ? `${alias}.${name}` : name);
/** SQL: the invoice still owes money (its status is one of OPEN_STATUSES). */
export const openStatusSql = (alias?: string) =>
  `${column('status', alias)} IN (${OPEN_STATUSES.map((s) => `'${s}'`).join(',')})`;
/** SQL: the invoice's unpaid amount, never below zero. */
export const outstandingSql = (alias?: string) =>
  `GREATEST(${column('total_cents', alias)} - ${column('paid_cents', alias)}, 0)`;

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
