// Pure billing helpers: months in a co-op's time zone, invoice labels, CSV cells, and the
// closed-month SQLSTATE becoming a 409.
import { describe, expect, it } from 'vitest';
import { centsToDecimal } from '@/lib/billing/csv';
import { csvRows } from '@/lib/csv';

/** One cell as the CSV writer writes it (a one-cell document without its line end). */
const csvCell = (v: string | number | null) => csvRows([[v]]).slice(0, -2);
import { addDays, currentPeriod, invoiceLabel, periodLabel, periodToDate, shiftPeriod } from '@/lib/billing/periods';
import { todayIn } from '@/lib/dates';
import { errorResponse } from '@/lib/http';

describe('billing months', () => {
  it('turns YYYY-MM into the stored first day and a readable label', () => {
    expect(periodToDate('2026-11')).toBe('2026-11-01');
    expect(() => periodToDate('2026-13')).toThrow(RangeError);
    expect(periodLabel('2026-11')).toBe('November 2026');
  });

  it('steps across year ends', () => {
    expect(shiftPeriod('2026-12', 1)).toBe('2027-01');
    expect(shiftPeriod('2026-01', -1)).toBe('2025-12');
    expect(addDays('2026-12-25', 14)).toBe('2027-01-08');
  });

  it('takes "today" and "this month" in the co-op’s time zone, not UTC', () => {
    // 03:00 UTC on 1 December is still 30 November, 21:00, in Chicago (UTC−6 in winter, IANA tz database).
    const at = new Date('2026-12-01T03:00:00Z');
    expect(todayIn('America/Chicago', at)).toBe('2026-11-30');
    expect(currentPeriod('America/Chicago', at)).toBe('2026-11');
    expect(currentPeriod('Europe/Berlin', at)).toBe('2026-12');
  });

  it('labels invoices and credit notes from the one per-co-op sequence', () => {
    expect(invoiceLabel('invoice', 12)).toBe('INV-000012');
    expect(invoiceLabel('credit-note', 13)).toBe('CN-000013');
    expect(invoiceLabel('invoice', null)).toBeNull();
  });
});

describe('CSV cells', () => {
  it('writes cents as plain decimals without floating point', () => {
    expect(centsToDecimal(123456)).toBe('1234.56');
    expect(centsToDecimal(-5)).toBe('-0.05');
    expect(centsToDecimal(0)).toBe('0.00');
  });

  it('quotes per RFC 4180 and defuses formula injection (OWASP CSV injection)', () => {
    expect(csvCell('Pemberton, Dale')).toBe('"Pemberton, Dale"');
    expect(csvCell('He said "hi"')).toBe('"He said ""hi"""');
    expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
    expect(csvCell('+1')).toBe("'+1");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell(null)).toBe('');
  });
});

describe('closed-month refusals from the database', () => {
  it('answer 409 with the database’s message', async () => {
    const err = Object.assign(new Error('wrapped'), {
      original: { code: 'TV409', message: 'Billing month 2026-10 is closed: …' },
    });
    const res = errorResponse(err);
    expect(res.status).toBe(409);
    expect(await res.json()).toEqual({ error: 'Billing month 2026-10 is closed: …', code: 'locked' });
  });
});
