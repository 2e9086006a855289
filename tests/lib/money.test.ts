import { describe, it, expect } from 'vitest';
import {
  roundHalfUp,
  multiplyCents,
  sumCents,
  allocate,
  formatCents,
  formatRateCents,
  parseMoneyToCents,
  safeParseMoneyToCents,
} from '@/lib/money';

describe('roundHalfUp — the money rounding rule (half away from zero)', () => {
  it('rounds halves away from zero, hand-computed', () => {
    expect(roundHalfUp(0.5)).toBe(1);
    expect(roundHalfUp(1.5)).toBe(2);
    expect(roundHalfUp(2.5)).toBe(3); // not banker's rounding
    expect(roundHalfUp(-0.5)).toBe(-1);
    expect(roundHalfUp(-2.5)).toBe(-3);
    expect(roundHalfUp(2.4999)).toBe(2);
    expect(roundHalfUp(-2.4999)).toBe(-2);
    expect(roundHalfUp(0)).toBe(0);
    expect(Object.is(roundHalfUp(-0.2), 0)).toBe(true); // never -0
  });

  it('is not fooled by binary floating-point noise (1.005 × 100 is meant as 100.5)', () => {
    expect(1.005 * 100).toBeLessThan(100.5); // the IEEE-754 artefact
    expect(roundHalfUp(1.005 * 100)).toBe(101);
    expect(roundHalfUp(4.35 * 100)).toBe(435);
    expect(roundHalfUp(0.1 + 0.2)).toBe(0);
  });

  it('rejects non-finite values', () => {
    expect(() => roundHalfUp(Number.NaN)).toThrow(RangeError);
    expect(() => roundHalfUp(Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });
});

describe('multiplyCents / sumCents', () => {
  it('price × gallons rounded to the cent, hand-computed', () => {
    expect(multiplyCents(389, 12.5)).toBe(4863); // 4862.5 → 4863
    expect(multiplyCents(389, 10)).toBe(3890);
    expect(multiplyCents(350, 0.001)).toBe(0); // 0.35 → 0
    expect(multiplyCents(24.4, 10.5)).toBe(256); // 256.2 → 256 (fractional statutory rate)
    expect(multiplyCents(-389, 12.5)).toBe(-4863);
  });

  it('rejects non-finite inputs', () => {
    expect(() => multiplyCents(Number.NaN, 1)).toThrow(RangeError);
    expect(() => multiplyCents(100, Number.NaN)).toThrow(RangeError);
  });

  it('sums integer cents exactly and rejects fractions', () => {
    expect(sumCents([])).toBe(0);
    expect(sumCents([10, 20, -5])).toBe(25);
    expect(() => sumCents([10, 0.5])).toThrow(RangeError);
    expect(() => sumCents([Number.MAX_SAFE_INTEGER, 1])).toThrow(RangeError);
  });
});

describe('allocate — largest remainder', () => {
  it('splits 100 ¢ three ways as 34/33/33', () => {
    expect(allocate(100, [1, 1, 1])).toEqual([34, 33, 33]);
  });

  it('gives the extra cent to the largest remainder', () => {
    // 1000 × [0.2, 0.35, 0.45] = 200, 350, 450 exactly
    expect(allocate(1000, [20, 35, 45])).toEqual([200, 350, 450]);
    // 10 × [1/6, 2/6, 3/6] = 1.667, 3.333, 5 → 2, 3, 5
    expect(allocate(10, [1, 2, 3])).toEqual([2, 3, 5]);
  });

  it('always sums to the total, including negatives and zero weights', () => {
    const parts = allocate(-1001, [3, 0, 7, 1]);
    expect(parts.reduce((a, b) => a + b, 0)).toBe(-1001);
    expect(parts[1]).toBe(0);
    for (let total = 0; total < 200; total += 7) {
      const p = allocate(total, [0.1, 0.2, 0.3, 0.4, 1 / 3]);
      expect(p.reduce((a, b) => a + b, 0)).toBe(total);
    }
  });

  it('rejects bad weights', () => {
    expect(() => allocate(100, [])).toThrow(RangeError);
    expect(() => allocate(100, [0, 0])).toThrow(RangeError);
    expect(() => allocate(100, [1, -1])).toThrow(RangeError);
    expect(() => allocate(10.5, [1])).toThrow(RangeError);
  });
});

describe('formatCents / formatRateCents', () => {
  it('formats USD in en-US', () => {
    expect(formatCents(123456)).toBe('$1,234.56');
    expect(formatCents(5)).toBe('$0.05');
    expect(formatCents(-5)).toBe('-$0.05');
    expect(formatCents(0)).toBe('$0.00');
  });

  it('formats other currencies and locales', () => {
    expect(formatCents(123456, 'EUR', 'de-DE')).toBe('1.234,56\u00a0€');
    expect(formatCents(100, 'CAD', 'en-CA')).toBe('$1.00');
  });

  it('rejects fractional cents', () => {
    expect(() => formatCents(1.5)).toThrow(RangeError);
  });

  it('formats a fractional rate: US federal diesel tax 24.4 ¢/gal → $0.244 (IRS Publication 510)', () => {
    expect(formatRateCents(24.4)).toBe('$0.244');
    expect(formatRateCents(389)).toBe('$3.89');
  });
});

describe('parseMoneyToCents', () => {
  it('parses without floating-point arithmetic', () => {
    expect(parseMoneyToCents('12.34')).toBe(1234);
    expect(parseMoneyToCents('12')).toBe(1200);
    expect(parseMoneyToCents('12.5')).toBe(1250);
    expect(parseMoneyToCents('0.29')).toBe(29); // 0.29 × 100 = 28.999999999999996 in floats
    expect(parseMoneyToCents('-3.10')).toBe(-310);
    expect(parseMoneyToCents(' $1,234.56 ')).toBe(123456);
    expect(parseMoneyToCents('.5')).toBe(50);
    expect(parseMoneyToCents('7.')).toBe(700);
    expect(Object.is(parseMoneyToCents('-0'), 0)).toBe(true);
  });

  it('rejects more than two decimals, NaN and junk', () => {
    for (const bad of ['12.345', '', '   ', 'abc', 'NaN', '1e3', '12.3.4', '1,23', '.', '-', '$', '12,34.00']) {
      expect(() => parseMoneyToCents(bad), bad).toThrow(RangeError);
    }
    const result = safeParseMoneyToCents('1.999');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error).toMatch(/two decimals/);
  });

  it('rejects amounts beyond safe integers', () => {
    expect(safeParseMoneyToCents('99999999999999999').ok).toBe(false);
  });
});

describe('invoice rounding stated (lib/money rule)', () => {
  it('says each draw line is rounded to the cent half up and the invoice is the sum of its lines', async () => {
    const { INVOICE_ROUNDING_NOTE, roundHalfUp: round } = await import('@/lib/money');
    expect(INVOICE_ROUNDING_NOTE).toMatch(/Every draw line is rounded to the cent, half up/);
    expect(INVOICE_ROUNDING_NOTE).toMatch(/invoice total is the exact sum of its lines/);
    expect(round(2139.5)).toBe(2140); // half up, as the note says
  });
});
