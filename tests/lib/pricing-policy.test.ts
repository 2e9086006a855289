import { describe, expect, it } from 'vitest';
import {
  perGallonToPerUnit,
  perUnitToPerGallonText,
  policyInUnits,
  priceDraw,
  describePolicy,
  type PolicyRow,
} from '@/lib/tank/pricing-policy/convert';

// Hand-computed examples. Money rounding: lib/money roundHalfUp (half away from zero), per line.
// US gallon = 3.785411784 L (NIST Handbook 44). Road tax 24.4 ¢/gal: US federal diesel rate (IRS Publication 510).

const row = (o: Partial<PolicyRow>): PolicyRow => ({
  kind: 'fixed',
  price_cents_per_gallon: null,
  margin_cents_per_gallon: null,
  margin_pct: null,
  surcharge_cents_per_gallon: '0',
  road_tax_cents_per_gallon: '0',
  ...o,
});

describe('rates between the co-op unit and the stored cents per US gallon', () => {
  it('per-litre rates survive the round trip through 3-decimal per-gallon storage', () => {
    // 145 ¢/L × 3.785411784 = 548.8847 → 548.885 ¢/gal; back: 548.885 / 3.785411784 = 145.00009 → 145.000
    expect(perUnitToPerGallonText(145, 'metric')).toBe('548.885');
    expect(perGallonToPerUnit('548.885', 'metric')).toBe(145);
    for (const perLitre of [0.001, 2.5, 6.105, 99.999, 150, 1234.567]) {
      expect(perGallonToPerUnit(perUnitToPerGallonText(perLitre, 'metric'), 'metric')).toBe(perLitre);
    }
    expect(perUnitToPerGallonText(24.4, 'us')).toBe('24.400');
  });

  it('the stored policy reads back in co-op units', () => {
    expect(
      policyInUnits(
        row({
          kind: 'cost-plus-amount',
          margin_cents_per_gallon: '40.000',
          surcharge_cents_per_gallon: '10.000',
          road_tax_cents_per_gallon: '24.400',
        }),
        'us',
      ),
    ).toEqual({ kind: 'cost-plus-amount', marginCents: 40, surchargeCentsPerGallon: 10, roadTaxCentsPerGallon: 24.4 });
    expect(policyInUnits(row({ price_cents_per_gallon: '548.885' }), 'metric')).toEqual({
      kind: 'fixed',
      priceCents: 145,
      surchargeCentsPerGallon: 0,
      roadTaxCentsPerGallon: 0,
    });
  });
});

describe('priceDraw', () => {
  // A tank of 100 gal (378 541 mL) valued at 31 000 ¢: average 31 000 / 99.99995 gal = 310.00015 ¢/gal.
  const tank = { onHandMl: 378_541, valueCents: 31_000 };

  it('cost + 40 ¢/gal, 10 ¢ surcharge, 24.4 ¢ road tax, 12.5 gal road', () => {
    // base = round(310.00015) + 40 = 350 ¢/gal
    // fuel = 350 × 12.5 = 4375; surcharge = 10 × 12.5 = 125; tax = 24.4 × 12.5 = 305; total = 4805
    const p = priceDraw(
      row({
        kind: 'cost-plus-amount',
        margin_cents_per_gallon: '40',
        surcharge_cents_per_gallon: '10',
        road_tax_cents_per_gallon: '24.4',
      }),
      'us',
      tank,
      12_500,
      'road',
    );
    expect(p.charge).toEqual({ fuelCents: 4375, surchargeCents: 125, taxCents: 305, totalCents: 4805 });
    expect(p.locked).toEqual({
      unitPriceCentsPerGallon: '350.000',
      surchargeCentsPerGallon: '10.000',
      roadTaxCentsPerGallon: '24.400',
    });
  });

  it('the same policy for heating: no road tax', () => {
    // 3 gal: fuel 350 × 3 = 1050; surcharge 10 × 3 = 30; tax 0 → 1080
    const p = priceDraw(
      row({
        kind: 'cost-plus-amount',
        margin_cents_per_gallon: '40',
        surcharge_cents_per_gallon: '10',
        road_tax_cents_per_gallon: '24.4',
      }),
      'us',
      tank,
      3_000,
      'heating',
    );
    expect(p.charge).toEqual({ fuelCents: 1050, surchargeCents: 30, taxCents: 0, totalCents: 1080 });
    expect(p.locked.roadTaxCentsPerGallon).toBe('0.000');
  });

  it('cost + 15 %: 310.00015 × 1.15 = 356.5002 → 357 ¢/gal; 2 gal = 714', () => {
    const p = priceDraw(row({ kind: 'cost-plus-percent', margin_pct: '15.00' }), 'us', tank, 2_000, 'off-road');
    expect(p.perUnit.baseCents).toBe(357);
    expect(p.charge.totalCents).toBe(714);
  });

  it('fixed 425 ¢/gal, 7.3 gal road at 18.4 ¢ tax: 3102.5 → 3103 and 134.32 → 134, total 3237', () => {
    const p = priceDraw(
      row({ price_cents_per_gallon: '425', road_tax_cents_per_gallon: '18.4' }),
      'us',
      { onHandMl: 0, valueCents: 0 },
      7_300,
      'road',
    );
    expect(p.charge).toEqual({ fuelCents: 3103, surchargeCents: 0, taxCents: 134, totalCents: 3237 });
  });

  it('a litre co-op prices per litre exactly: 145 ¢/L × 40 L = 5800, surcharge 2.5 ¢/L × 40 = 100', () => {
    const p = priceDraw(
      row({ price_cents_per_gallon: '548.885', surcharge_cents_per_gallon: perUnitToPerGallonText(2.5, 'metric') }),
      'metric',
      { onHandMl: 600_000, valueCents: 49_200 },
      40_000,
      'off-road',
    );
    expect(p.charge).toEqual({ fuelCents: 5800, surchargeCents: 100, taxCents: 0, totalCents: 5900 });
    expect(p.locked.unitPriceCentsPerGallon).toBe('548.885');
    expect(p.avgCostCentsPerUnit).toBe(82); // 49 200 ¢ / 600 L
  });

  it('describes a policy in the co-op units', () => {
    expect(
      describePolicy(
        { kind: 'cost-plus-amount', marginCents: 40, surchargeCentsPerGallon: 10, roadTaxCentsPerGallon: 24.4 },
        'us',
      ),
    ).toBe('Average cost + $0.40/gal · reserve surcharge 10¢/gal · road tax 24.4¢/gal (road use only)');
    expect(describePolicy({ kind: 'fixed', priceCents: 145 }, 'metric')).toBe('Fixed $1.45/L');
  });
});
