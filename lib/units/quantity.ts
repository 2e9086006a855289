/**
 * Fuel quantities are stored as litres NUMERIC(14,3). In JavaScript we handle them as whole
 * millilitres (exact integers) and turn them back into the "123.456" strings PostgreSQL takes.
 */
export function litersToMl(liters: string | number): number {
  const s = typeof liters === 'number' ? liters.toFixed(3) : liters.trim();
  const m = /^(-?)(\d+)(?:\.(\d{1,3})\d*)?$/.exec(s);
  if (!m) throw new Error(`not a quantity: ${liters}`);
  const ml = Number(m[2]) * 1000 + Number((m[3] ?? '').padEnd(3, '0'));
  return m[1] ? -ml : ml;
}

export function mlToLiters(ml: number): string {
  const sign = ml < 0 ? '-' : '';
  const a = Math.abs(Math.round(ml));
  return `${sign}${Math.floor(a / 1000)}.${String(a % 1000).padStart(3, '0')}`;
}

/**
 * A stored NUMERIC or BIGINT (pg answers text) as a JavaScript number, null kept: for answers
 * and display. Sums and comparisons of litres stay in whole millilitres ({@link litersToMl}).
 */
export function numericOrNull(v: string | number | null | undefined): number | null {
  return v === null || v === undefined ? null : Number(v);
}
