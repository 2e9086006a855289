import { todayIn } from '@/lib/dates';

/**
 * Billing months, pure (safe for client components). A period is written 'YYYY-MM' in URLs and
 * forms and stored as the first day of the month ('YYYY-MM-01', a DATE). Month boundaries are
 * taken in the co-op's time zone (the database computes the instants; see lib/billing/locks.ts).
 */

export const PERIOD_PATTERN = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** 'YYYY-MM' → 'YYYY-MM-01'. */
export function periodToDate(period: string): string {
  if (!PERIOD_PATTERN.test(period)) throw new RangeError(`not a billing month: ${period}`);
  return `${period}-01`;
}

/** 'YYYY-MM-DD' (or a Date) → 'YYYY-MM'. */
export function dateToPeriod(date: string | Date): string {
  const s = typeof date === 'string' ? date : date.toISOString();
  return s.slice(0, 7);
}

// Intl formatters are costly to build; keep one per option set (PDFs format dozens of dates).
const formatters = new Map<string, Intl.DateTimeFormat>();
function dateFormat(locale: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let f = formatters.get(key);
  if (!f) formatters.set(key, (f = new Intl.DateTimeFormat(locale, options)));
  return f;
}

/** 'November 2026'. */
export function periodLabel(period: string): string {
  const [y, m] = period.split('-').map(Number) as [number, number];
  return dateFormat('en-US', { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(
    new Date(Date.UTC(y, m - 1, 1)),
  );
}

/** The month after (or before, with a negative step). */
export function shiftPeriod(period: string, months: number): string {
  const [y, m] = period.split('-').map(Number) as [number, number];
  const d = new Date(Date.UTC(y, m - 1 + months, 1));
  return `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`;
}

/** The current billing month 'YYYY-MM' in a time zone. */
export function currentPeriod(timeZone: string, now = new Date()): string {
  return todayIn(timeZone, now).slice(0, 7);
}

/** Adds days to a 'YYYY-MM-DD' date. */
export function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** Invoices are due this many days after issue (common practice for member accounts: net 14). */
export const PAYMENT_TERMS_DAYS = 14;

/** 'INV-000012' for invoices, 'CN-000013' for credit notes (one sequence per co-op); null for drafts. */
export function invoiceLabel(kind: 'invoice' | 'credit-note', number: number | null): string | null {
  if (number === null) return null;
  return `${kind === 'credit-note' ? 'CN' : 'INV'}-${String(number).padStart(6, '0')}`;
}
