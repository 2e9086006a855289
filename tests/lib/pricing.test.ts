import { describe, it, expect } from 'vitest';
import { memberPriceCentsPerGallon, drawCharge, drawChargeCents, type PricingPolicy } from '@/lib/pricing';

// Hand-computed examples; rounding follows lib/money (half away from zero).
// Road tax example uses the US federal rate on diesel fuel, 24.4 ¢/gal (IRS Publication 510).

describe('memberPriceCentsPerGallon', () => {
  it('fixed: 450 ¢ + 10 ¢ surcharge + 24.4 ¢ road tax = 484.4 ¢/gal for road use', () => {
    const policy: PricingPolicy = {
      kind: 'fixed',
      priceCents: 450,
      surchargeCentsPerGallon: 10,
      roadTaxCentsPerGallon: 24.4,
    };
    expect(memberPriceCentsPerGallon(policy, null, 'road')).toEqual({
      baseCents: 450,
      surchargeCents: 10,
      taxCents: 24.4,
      totalCents: 484.4,
    });
  });

  it('road tax applies only to road use', () => {
    const policy: PricingPolicy = {
      kind: 'fixed',
      priceCents: 450,
      surchargeCentsPerGallon: 10,
      roadTaxCentsPerGallon: 24.4,
    };
    expect(memberPriceCentsPerGallon(policy, null, 'off-road')).toEqual({
      baseCents: 450,
      surchargeCents: 10,
      taxCents: 0,
      totalCents: 460,
    });
    expect(memberPriceCentsPerGallon(policy, null, 'heating').taxCents).toBe(0);
  });

  it('cost-plus-amount: average 306.4 → 306 ¢ + 50 ¢ margin = 356 ¢/gal', () => {
    expect(memberPriceCentsPerGallon({ kind: 'cost-plus-amount', marginCents: 50 }, 306.4, 'off-road')).toEqual({
      baseCents: 356,
      surchargeCents: 0,
      taxCents: 0,
      totalCents: 356,
    });
  });

  it('cost-plus-percent: 300 ¢ + 15 % = 345; 333 + 10 % = 366.3 → 366; 305 + 10 % = 335.5 → 336', () => {
    expect(memberPriceCentsPerGallon({ kind: 'cost-plus-percent', marginPct: 15 }, 300, 'off-road').baseCents).toBe(
      345,
    );
    expect(memberPriceCentsPerGallon({ kind: 'cost-plus-percent', marginPct: 10 }, 333, 'off-road').baseCents).toBe(
      366,
    );
    expect(memberPriceCentsPerGallon({ kind: 'cost-plus-percent', marginPct: 10 }, 305, 'off-road').baseCents).toBe(
      336,
    );
  });

  it('cost-plus-percent with road tax and surcharge: 300 × 1.2 = 360 + 5 + 24.4 = 389.4', () => {
    const r = memberPriceCentsPerGallon(
      { kind: 'cost-plus-percent', marginPct: 20, surchargeCentsPerGallon: 5, roadTaxCentsPerGallon: 24.4 },
      300,
      'road',
    );
    expect(r).toEqual({ baseCents: 360, surchargeCents: 5, taxCents: 24.4, totalCents: 389.4 });
  });

  it('cost-based policies need the tank average; bad inputs are rejected', () => {
    expect(() => memberPriceCentsPerGallon({ kind: 'cost-plus-amount', marginCents: 50 }, null, 'road')).toThrow(
      RangeError,
    );
    expect(() => memberPriceCentsPerGallon({ kind: 'cost-plus-percent', marginPct: 10 }, -1, 'road')).toThrow(
      RangeError,
    );
    expect(() => memberPriceCentsPerGallon({ kind: 'fixed', priceCents: 4.5 }, null, 'road')).toThrow(RangeError);
    expect(() =>
      memberPriceCentsPerGallon({ kind: 'fixed', priceCents: 450, roadTaxCentsPerGallon: -1 }, null, 'road'),
    ).toThrow(RangeError);
    expect(() => memberPriceCentsPerGallon({ kind: 'cost-plus-percent', marginPct: -150 }, 300, 'road')).toThrow(
      RangeError,
    );
  });
});

describe('drawCharge / drawChargeCents', () => {
  const road = memberPriceCentsPerGallon(
    { kind: 'fixed', priceCents: 450, surchargeCentsPerGallon: 10, roadTaxCentsPerGallon: 24.4 },
    null,
    'road',
  );

  it('12.5 gal: fuel 5625 + surcharge 125 + tax 305 = 6055 ¢', () => {
    expect(drawCharge(12.5, road)).toEqual({ fuelCents: 5625, surchargeCents: 125, taxCents: 305, totalCents: 6055 });
    expect(drawChargeCents(12.5, road)).toBe(6055);
  });

  it('rounds each line half up and totals the rounded lines: 10.333 gal', () => {
    // fuel 4649.85 → 4650; surcharge 103.33 → 103; tax 252.1252 → 252
    expect(drawCharge(10.333, road)).toEqual({ fuelCents: 4650, surchargeCents: 103, taxCents: 252, totalCents: 5005 });
  });

  it('cost-plus-amount 356 ¢ × 10.333 gal = 3678.548 → 3679 ¢', () => {
    const price = memberPriceCentsPerGallon({ kind: 'cost-plus-amount', marginCents: 50 }, 306, 'off-road');
    expect(drawChargeCents(10.333, price)).toBe(3679);
  });

  it('0 gallons is 0; negative gallons are rejected', () => {
    expect(drawChargeCents(0, road)).toBe(0);
    expect(() => drawChargeCents(-1, road)).toThrow(RangeError);
  });
});
