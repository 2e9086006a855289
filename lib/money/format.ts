import { assertCents } from './rounding';
import { numberFormat } from '@/lib/intl';

/** Cents in one unit of the currencies the app supports (two-decimal currencies: USD, CAD, EUR, GBP …). */
export const CENTS_PER_UNIT = 100; // ISO 4217 minor unit exponent 2 for USD, CAD, EUR, GBP

/**
 * Formats integer cents as a currency string for display.
 * Assumes a currency with two decimal places (ISO 4217 minor unit 2), as all amounts are
 * stored in cents.
 * @param cents integer amount of cents
 * @param currency ISO 4217 code, default 'USD'
 * @param locale BCP 47 locale for the digits and symbol, default 'en-US'
 * @returns e.g. formatCents(123456) → "$1,234.56"; formatCents(-5) → "-$0.05"
 */
export function formatCents(cents: number, currency = 'USD', locale = 'en-US'): string {
  assertCents(cents, 'cents');
  return numberFormat(locale, {
    style: 'currency',
    currency,
    minimumFractionDigits: 2,
    maximumFractionDigits: 2,
  }).format(cents / CENTS_PER_UNIT);
}

/**
 * Formats a rate in cents that may carry a fraction of a cent (e.g. a tax of 24.4 ¢/gal)
 * as currency with up to `maxDecimals` decimals: formatRateCents(24.4) → "$0.244".
 * @param rateCents cents per unit (finite)
 * @param currency ISO 4217 code, default 'USD'
 * @param locale BCP 47 locale, default 'en-US'
 * @param maxDecimals most decimals of the currency unit shown (2–6, default 3)
 * @returns the formatted rate, without a unit suffix
 */
export function formatRateCents(rateCents: number, currency = 'USD', locale = 'en-US', maxDecimals = 3): string {
  if (!Number.isFinite(rateCents)) throw new RangeError(`rateCents must be finite, got ${rateCents}`);
  return numberFormat(locale, {
    style: 'currency',
    currency,
    minimumFractionDigits: 2,
    maximumFractionDigits: Math.min(6, Math.max(2, maxDecimals)),
  }).format(rateCents / CENTS_PER_UNIT);
}

/** The outcome of {@link safeParseMoneyToCents}. */
export type MoneyParseResult = { ok: true; cents: number } | { ok: false; error: string };

const MONEY_PATTERN = /^([+-])?\$?(\d{1,3}(?:,\d{3})+|\d+)?(?:\.(\d*))?$/;

/**
 * Parses a typed money amount ("12.34", "12", "12.5", "-3.10", "$1,234.56") into integer
 * cents without floating-point arithmetic. Rejects more than two decimals, empty input and
 * anything that is not a number.
 * @param input the text as typed
 * @returns `{ ok: true, cents }` or `{ ok: false, error }`
 */
export function safeParseMoneyToCents(input: string): MoneyParseResult {
  const text = input.trim().replace(/\s+/g, '');
  const match = MONEY_PATTERN.exec(text);
  if (text === '' || !match) return { ok: false, error: 'Enter an amount such as 12.34' };
  const [, sign, wholeRaw, fraction] = match;
  if (wholeRaw === undefined && (fraction === undefined || fraction === '')) {
    return { ok: false, error: 'Enter an amount such as 12.34' };
  }
  if (fraction !== undefined && fraction.length > 2) {
    return { ok: false, error: 'Use at most two decimals (whole cents)' };
  }
  const whole = (wholeRaw ?? '0').replace(/,/g, '');
  const cents = Number(whole) * CENTS_PER_UNIT + Number((fraction ?? '').padEnd(2, '0'));
  if (!Number.isSafeInteger(cents)) return { ok: false, error: 'Amount is too large' };
  return { ok: true, cents: sign === '-' && cents !== 0 ? -cents : cents };
}

/**
 * Parses a typed money amount into integer cents; see {@link safeParseMoneyToCents}.
 * @param input the text as typed, e.g. "12.34"
 * @returns integer cents, e.g. 1234
 * @throws RangeError when the text is not an amount with at most two decimals
 */
export function parseMoneyToCents(input: string): number {
  const result = safeParseMoneyToCents(input);
  if (!result.ok) throw new RangeError(`${result.error}: "${input}"`);
  return result.cents;
}

/**
 * How an invoice's amounts are rounded, stated on the invoice page and its PDF (the rule of
 * {@link roundHalfUp} in lib/money/rounding: per line, to the cent, halves away from zero — for
 * the positive amounts of draws, half up).
 */
export const INVOICE_ROUNDING_NOTE =
  'Each draw was priced when it was recorded, at the co-op price then in force. Every draw line is rounded to the cent, half up (half a cent or more rounds up; credits round the same way, away from zero), and the invoice total is the exact sum of its lines.';
