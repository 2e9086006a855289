/** CSV building blocks for the accountant's exports (pure: no I/O). */

/** Cents as a plain decimal for spreadsheets ("1234.50", "-0.05"): no symbol, no grouping. */
export function centsToDecimal(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const a = Math.abs(cents);
  return `${sign}${Math.floor(a / 100)}.${String(a % 100).padStart(2, '0')}`;
}
