/** CSV building blocks for the accountant's exports (pure: no I/O). */

/** Cents as a plain decimal for spreadsheets ("1234.50", "-0.05"): no symbol, no grouping. */
export function centsToDecimal(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const a = Math.abs(cents);
  return `${sign}${Math.floor(a / 100)}.${String(a % 100).padStart(2, '0')}`;
}

/**
 * One CSV cell (RFC 4180 quoting). Text that a spreadsheet would run as a formula (starting with
 * = + - @ or a control character) is prefixed with an apostrophe (OWASP "CSV injection").
 */
export function csvCell(v: string | number | null | undefined, { text = true } = {}): string {
  if (v === null || v === undefined) return '';
  let s = String(v);
  if (text && /^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
