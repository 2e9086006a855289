// Values in an import file, read the way the co-op's spreadsheets write them (pure: no I/O).
// US co-ops: 1,234.50 and MM/DD/YYYY; metric co-ops: 1.234,50 (or 1 234,50) and DD/MM/YYYY.
// ISO dates (YYYY-MM-DD) and plain decimals with a dot are read everywhere.
import { parseLocaleNumber } from './csv-read';

type Units = 'us' | 'metric';
export type ValueResult<T> = { ok: true; value: T } | { ok: false; error: string };

/** The decimal mark of the co-op's spreadsheets. */
export const decimalMarkFor = (units: Units): '.' | ',' => (units === 'us' ? '.' : ',');

/**
 * A number as written in the co-op's locale; a metric co-op's file written with dot decimals
 * (`12.50`) is read too, when it cannot be a thousands group. Returns the decimal string.
 */
export function readNumber(raw: string, units: Units): ValueResult<string> {
  if (raw.trim() === '') return { ok: false, error: 'Empty: enter a number.' };
  const mark = decimalMarkFor(units);
  const n = parseLocaleNumber(raw, mark) ?? (mark === ',' ? parseLocaleNumber(raw, '.') : null);
  if (n === null)
    return {
      ok: false,
      error: `"${raw}" is not a number (write it like ${units === 'us' ? '1,234.50' : '1.234,50'}).`,
    };
  return { ok: true, value: n };
}

/** Money → integer cents (at most two decimals; never through a float). */
export function readMoneyCents(raw: string, units: Units): ValueResult<number> {
  const n = readNumber(raw, units);
  if (!n.ok) return n;
  const [whole, frac = ''] = n.value.replace('-', '').split('.') as [string, string?];
  if (frac.length > 2) return { ok: false, error: `"${raw}" has more than two decimals (whole cents only).` };
  const cents = Number(whole) * 100 + Number(frac.padEnd(2, '0'));
  if (!Number.isSafeInteger(cents) || cents > 100_000_000_00) return { ok: false, error: `"${raw}" is too large.` };
  return { ok: true, value: n.value.startsWith('-') ? -cents : cents };
}

/** A quantity ≥ 0 with at most `decimals` decimals, as a decimal string (stock stays exact). */
export function readQuantity(raw: string, units: Units, decimals = 3): ValueResult<string> {
  const n = readNumber(raw, units);
  if (!n.ok) return n;
  if (n.value.startsWith('-')) return { ok: false, error: 'Cannot be negative.' };
  if ((n.value.split('.')[1] ?? '').length > decimals) return { ok: false, error: `At most ${decimals} decimals.` };
  return { ok: true, value: n.value };
}

/** Whole thousandths of the unit from an exact decimal string ("1200.5" → 1200500). */
export const toMilli = (decimal: string) => {
  const [whole, frac = ''] = decimal.split('.') as [string, string?];
  return Number(whole) * 1000 + Number(frac.padEnd(3, '0'));
};

const pad = (n: number) => String(n).padStart(2, '0');

/**
 * A calendar date: YYYY-MM-DD anywhere, else MM/DD/YYYY in US co-ops and DD/MM/YYYY (also with
 * `.` or `-`) in metric ones; two-digit years are refused (ambiguous). Returns 'YYYY-MM-DD'.
 */
export function readDate(raw: string, units: Units): ValueResult<string> {
  const s = raw.trim();
  const hint = units === 'us' ? 'MM/DD/YYYY' : 'DD/MM/YYYY';
  let y: number, m: number, d: number;
  let match = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(s);
  if (match) [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  else if ((match = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})$/.exec(s))) {
    const a = Number(match[1]);
    const b = Number(match[2]);
    [m, d] = units === 'us' ? [a, b] : [b, a];
    y = Number(match[3]);
  } else
    return {
      ok: false,
      error: s ? `"${s}" is not a date: write ${hint} or YYYY-MM-DD.` : `Empty: enter a date (${hint}).`,
    };
  const date = new Date(Date.UTC(y, m - 1, d));
  if (m < 1 || m > 12 || date.getUTCMonth() !== m - 1 || date.getUTCDate() !== d || y < 1990) {
    return { ok: false, error: `"${s}" is not a date on the calendar (${hint}).` };
  }
  return { ok: true, value: `${y}-${pad(m)}-${pad(d)}` };
}
