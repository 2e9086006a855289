import { describe, expect, it } from 'vitest';
import {
  coveredMl,
  formatMl,
  milliUnitsToMl,
  mlToUnits,
  mlToUnitsFloor,
  roundingCrumbMl,
  tankAvailableMl,
} from '@/lib/tank/volume';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { zonedToUtc } from '@/lib/dates';
import { reservationWindow, parseWindowEdge } from '@/lib/tank/reservations/window';
import { drawQuantityMilli, drawCreateSchema, quantitySchema, reservationCreateSchema } from '@/lib/validation/tank';

// US gallon = 3.785411784 L exactly (NIST Handbook 44), so 1 gal = 3785.411784 mL.

describe('co-op units ↔ stored millilitres', () => {
  it('rounds gallons to the nearest millilitre and keeps litres exact', () => {
    expect(milliUnitsToMl(100_000, 'us')).toBe(378_541); // 100 gal = 378 541.1784 mL
    expect(milliUnitsToMl(12_500, 'us')).toBe(47_318); // 12.5 gal = 47 317.6473 mL
    expect(milliUnitsToMl(20_000, 'us')).toBe(75_708); // 20 gal = 75 708.2357 mL
    expect(milliUnitsToMl(40_000, 'metric')).toBe(40_000);
    expect(mlToLiters(milliUnitsToMl(1_000_000, 'us'))).toBe('3785.412'); // 1,000 gal tank
  });

  it('shows as available exactly what a member can then reserve (up to the 3 mL rounding crumb)', () => {
    // 75 708 mL is 19.99999 gal, but a request for 20.000 gal (75 708 mL) fits, so 20 is shown.
    expect(mlToUnitsFloor(75_708, 'us')).toBe(20);
    expect(mlToUnitsFloor(75_708, 'us', 1)).toBe(20);
    // 20 gal is trimmed to what is left when it is over by ≤ 3 mL: still 20 at 75 705 mL ...
    expect(roundingCrumbMl('us')).toBe(3);
    expect(mlToUnitsFloor(75_705, 'us')).toBe(20);
    // ... but not at 75 704 mL, where 19.999 gal (75 704.45 → 75 704 mL) is the most that fits.
    expect(mlToUnitsFloor(75_704, 'us')).toBe(19.999);
    for (const ml of [1, 999, 3785, 3786, 123_456, 378_541, 999_999]) {
      const shown = Math.round(mlToUnitsFloor(ml, 'us') * 1000);
      expect(milliUnitsToMl(shown, 'us')).toBeLessThanOrEqual(ml + 3);
      expect(milliUnitsToMl(shown + 1, 'us')).toBeGreaterThan(ml + 3);
    }
    expect(mlToUnitsFloor(-5, 'metric')).toBe(0);
    expect(roundingCrumbMl('metric')).toBe(0);
    expect(mlToUnitsFloor(40_000, 'metric')).toBe(40);
  });

  it('a request is covered whole, trimmed by at most a rounding crumb, or refused; available is never below zero', () => {
    // "100 gal in, 12.5 gal reserved": 378 541 − 47 318 = 331 223 mL, while 87.5 gal asked for is
    // 331 223.53 → 331 224 mL (NIST Handbook 44's gallon): one millilitre over, so trimmed.
    const leftMl = milliUnitsToMl(100_000, 'us') - milliUnitsToMl(12_500, 'us');
    expect(coveredMl(milliUnitsToMl(87_500, 'us'), leftMl, 'us')).toBe(leftMl);
    expect(coveredMl(50_000, leftMl, 'us')).toBe(50_000);
    expect(coveredMl(leftMl + 4, leftMl, 'us')).toBeNull(); // beyond the 3 mL crumb
    expect(coveredMl(40_001, 40_000, 'metric')).toBeNull(); // litres are exact: no crumb
    expect(coveredMl(2, 0, 'us')).toBeNull(); // nothing left is never "a crumb short"
    // On hand 313 L, all of it held for a batch under review, 5 L reserved before the hold: 0, not −5.
    expect(tankAvailableMl(313_000, 5_000, 313_000)).toBe(0);
    expect(tankAvailableMl(1_000_000, 250_000, 100_000)).toBe(650_000);
  });

  it('formats in the co-op unit, with an optional sign', () => {
    expect(formatMl(378_541, 'us')).toBe('100.0 gal');
    expect(formatMl(-47_318, 'us', { signed: true, digits: 2 })).toBe('-12.50 gal');
    expect(formatMl(47_318, 'us', { signed: true, digits: 2 })).toBe('+12.50 gal');
    expect(formatMl(1_500_000, 'metric')).toBe('1,500.0 L');
    expect(mlToUnits(3_785_412, 'us')).toBeCloseTo(1000, 3); // 3785.412 L = 1000.00006 gal
  });

  it('litre strings and millilitres agree', () => {
    expect(litersToMl('1058.023')).toBe(1_058_023);
    expect(mlToLiters(-47_318)).toBe('-47.318');
  });
});

describe('form values', () => {
  it('quantities are exact thousandths, positive, at most 3 decimals', () => {
    expect(quantitySchema.parse('12.5')).toBe(12_500);
    expect(quantitySchema.parse(0.1)).toBe(100);
    expect(quantitySchema.parse('.25')).toBe(250);
    expect(quantitySchema.safeParse('0').error?.issues[0]?.message).toMatch(/greater than zero/);
    expect(quantitySchema.safeParse('-3').error?.issues[0]?.message).toMatch(/greater than zero/);
    expect(quantitySchema.safeParse('1.2345').error?.issues[0]?.message).toMatch(/at most 3 decimals/);
    expect(quantitySchema.safeParse('ten').success).toBe(false);
  });

  it('a meter reading that goes backwards is refused on the after reading', () => {
    const r = drawCreateSchema.safeParse({ tankId: 1, meterBefore: '100', meterAfter: '99.5', declaredUse: 'road' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual(['meterAfter']);
    const ok = drawCreateSchema.parse({ tankId: 1, meterBefore: '1204.2', meterAfter: '1216.7', declaredUse: 'road' });
    expect(drawQuantityMilli(ok)).toBe(12_500); // 1216.700 − 1204.200 = 12.5, in thousandths
  });

  it('a reservation for someone else (membershipId) is refused by field', () => {
    const r = reservationCreateSchema.safeParse({
      tankId: 1,
      quantity: 5,
      windowStart: '2026-12-03',
      windowEnd: '2026-12-04',
      membershipId: 7,
    });
    expect(r.error?.issues.map((i) => i.path.join('.'))).toContain('membershipId');
  });
});

describe('reservation windows in the co-op time zone', () => {
  const now = new Date('2026-12-01T12:00:00Z');
  it('a bare date runs from local midnight to the end of the last day', () => {
    // America/Chicago is UTC−6 in December (CST).
    const w = reservationWindow('2026-12-03', '2026-12-05', 'America/Chicago', now);
    expect(w.ok && w.start.toISOString()).toBe('2026-12-03T06:00:00.000Z');
    expect(w.ok && w.end.toISOString()).toBe('2026-12-06T06:00:00.000Z');
  });

  it('handles daylight-saving changes (Chicago switches to CDT, UTC−5, on 2026-03-08)', () => {
    expect(zonedToUtc(2026, 3, 9, 0, 0, 'America/Chicago').toISOString()).toBe('2026-03-09T05:00:00.000Z');
    expect(parseWindowEdge('2026-03-07', 'America/Chicago', true)?.toISOString()).toBe('2026-03-08T06:00:00.000Z');
  });

  it('refuses a window that ends before it starts, has already ended, or is too long', () => {
    const back = reservationWindow('2026-12-05', '2026-12-03', 'America/Chicago', now);
    expect(back.ok ? null : back.fields.windowEnd?.[0]).toMatch(/end after it starts/);
    const past = reservationWindow('2026-11-01', '2026-11-02', 'America/Chicago', now);
    expect(past.ok ? null : past.fields.windowEnd?.[0]).toMatch(/already ended/);
    const long = reservationWindow('2026-12-01', '2027-03-01', 'America/Chicago', now);
    expect(long.ok ? null : long.fields.windowEnd?.[0]).toMatch(/at most 60 days/);
    const junk = reservationWindow('soon', '2026-02-30', 'America/Chicago', now);
    expect(junk.ok ? null : Object.keys(junk.fields).sort()).toEqual(['windowEnd', 'windowStart']);
  });
});
