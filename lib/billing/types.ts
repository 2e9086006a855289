/** Plain shapes the billing services return (types only: safe to import from client components). */
import type { InvoiceEmailStatus, InvoiceKind, InvoiceStatus } from '@/models/Invoice';
import type { InvoiceLineKind } from '@/models/InvoiceLine';

export type { InvoiceKind, InvoiceStatus };
export type EmailStatus = InvoiceEmailStatus;

export interface InvoiceSummary {
  id: number;
  kind: InvoiceKind;
  number: number | null;
  /** 'INV-000012', 'CN-000013', or null for a draft. */
  label: string | null;
  status: InvoiceStatus;
  /** 'YYYY-MM' */
  period: string;
  memberId: number;
  memberName: string;
  memberEmail: string;
  totalCents: number;
  paidCents: number;
  outstandingCents: number;
  issuedAt: string | null;
  dueOn: string | null;
  overdue: boolean;
  emailStatus: EmailStatus;
  creditNoteForId: number | null;
  creditNoteId: number | null;
}

export interface InvoiceLineDTO {
  id: string;
  kind: InvoiceLineKind;
  description: string;
  occurredAt: string | null;
  /** Litres (negative on reversals); shown in the co-op's units. */
  quantityLiters: number | null;
  unitPriceCentsPerGallon: number | null;
  amountCents: number;
}

export interface PaymentDTO {
  id: number;
  method: 'card' | 'cash' | 'cheque';
  memberId: number;
  memberName: string;
  invoiceId: number | null;
  invoiceLabel: string | null;
  invoicePeriod: string | null;
  amountCents: number;
  appliedCents: number;
  creditedCents: number;
  unallocatedCents: number;
  refundedCents: number;
  /** What may still be given back: the unmatched part plus this payment's share of the member's credit. */
  refundableCents: number;
  receivedOn: string;
  period: string;
  reference: string | null;
  note: string | null;
  periodClosed: boolean;
  refunds: RefundDTO[];
}

export interface RefundDTO {
  id: number;
  amountCents: number;
  status: 'pending' | 'succeeded' | 'failed';
  reason: string;
  refundedOn: string;
  failureMessage: string | null;
}

export interface InvoiceDetail extends InvoiceSummary {
  lines: InvoiceLineDTO[];
  payments: PaymentDTO[];
  pendingAttempt: { id: number; createdAt: string } | null;
  lastFailedAttempt: { message: string; at: string } | null;
  voidReason: string | null;
  voidedAt: string | null;
  creditNote: { id: number; label: string | null } | null;
  original: { id: number; label: string | null } | null;
  periodClosed: boolean;
  emailedAt: string | null;
  emailAttempts: number;
}

export interface MemberBalance {
  /** Unpaid amounts of issued invoices. */
  outstandingCents: number;
  /** Credit held for the member (overpayments, voided invoices' payments), applied to the next invoice. */
  creditCents: number;
  /** Payments received but not matched to an invoice yet. */
  unallocatedCents: number;
}

export interface PageOf<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}
