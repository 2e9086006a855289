/** Plain shapes the billing services return (types only: safe to import from client components). */
import type {
  balanceSchema,
  invoiceDetailSchema,
  invoiceLineSchema,
  invoiceSummarySchema,
  paymentSchema,
  refundSchema,
} from '@/lib/api/dto/billing';
import type { z } from 'zod';
import type { InvoiceEmailStatus, InvoiceKind, InvoiceStatus } from '@/models/Invoice';

export type { InvoiceKind, InvoiceStatus };
export type EmailStatus = InvoiceEmailStatus;

export type InvoiceSummary = z.infer<typeof invoiceSummarySchema>;

export type InvoiceLineDTO = z.infer<typeof invoiceLineSchema>;

export type PaymentDTO = z.infer<typeof paymentSchema>;

export type RefundDTO = z.infer<typeof refundSchema>;

export type InvoiceDetail = z.infer<typeof invoiceDetailSchema>;

export type MemberBalance = z.infer<typeof balanceSchema>;
