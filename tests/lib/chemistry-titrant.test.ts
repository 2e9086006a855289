// Titrant-aware catalyst, methanol at altitude and the yield projection. Sources beside each
// check: IUPAC standard atomic weights, NIST Chemistry WebBook (methanol Antoine constants),
// US Standard Atmosphere 1976, CRC Handbook; common practice where marked.
import { describe, expect, it } from 'vitest';
import {
  IDEAL_FUEL_PER_OIL,
  KOH_PER_NAOH,
  altitudeNote,
  catalystGrams,
  expectedYields,
  methanolAntoineBoilingC,
  methanolBoilingPointC,
  pressureAtElevationPa,
  projectedFuelYield,
  temperatureBands,
  temperatureCheck,
} from '@/lib/chemistry';
import { fToC } from '@/lib/units';

describe('catalyst with either titrant (IUPAC molar masses; common practice purity rule)', () => {
  it('KOH batch at 90 %, NaOH titrant from pure reagent: (7 + 4 × 1.4027) ÷ 0.90 — converted, then purity applied once', () => {
    const r = catalystGrams({
      catalyst: 'KOH',
      titrant: 'NaOH',
      oilLiters: 100,
      baseGramsPerLiter: 7,
      titrationMl: 4,
      purityPct: 90,
      titrantFrom: 'pure-reagent',
    });
    expect(KOH_PER_NAOH).toBeCloseTo(56.106 / 39.997, 12); // IUPAC
    expect(r.gramsPerLiter).toBeCloseTo((7 + 4 * (56.106 / 39.997)) / 0.9, 9); // 14.0122 g/L
    expect(r.gramsPerLiter).toBeCloseTo(14.0122, 3);
    expect(r.totalGrams).toBeCloseTo(1401.22, 1);
    expect(r.rule).toBe('converted-all-over-purity');
    expect(r.explanation).toContain('pure reagent NaOH');
    expect(r.explanation).toContain('56.106 / 39.997');
    expect(r.explanation).not.toContain("batch's own");
    // the bug this replaces: converting, then adding under the same-stock rule, is ≈ 10 % short at 90 %
    const wrong = 7 / 0.9 + 4 * KOH_PER_NAOH;
    expect(r.gramsPerLiter / wrong).toBeGreaterThan(1.04);
  });

  it('NaOH batch at 97 %, KOH titrant from pure reagent: (3.5 + 5 ÷ 1.4027) ÷ 0.97 (IUPAC)', () => {
    const r = catalystGrams({
      catalyst: 'NaOH',
      titrant: 'KOH',
      oilLiters: 50,
      baseGramsPerLiter: 3.5,
      titrationMl: 5,
      purityPct: 97,
      titrantFrom: 'pure-reagent',
    });
    expect(r.gramsPerLiter).toBeCloseTo((3.5 + 5 * (39.997 / 56.106)) / 0.97, 9); // 7.2829 g/L
    expect(r.gramsPerLiter).toBeCloseTo(7.2829, 4);
    expect(r.rule).toBe('converted-all-over-purity');
  });

  it("a titrant of the other chemical cannot be made from the batch's own stock", () => {
    expect(() =>
      catalystGrams({
        catalyst: 'KOH',
        titrant: 'NaOH',
        oilLiters: 1,
        baseGramsPerLiter: 7,
        titrationMl: 4,
        purityPct: 90,
        titrantFrom: 'same-catalyst',
      }),
    ).toThrow(/cannot have been made from this batch's KOH stock/);
  });

  it("same chemical from the batch's own stock at 85 %: base ÷ purity + titration (the titration already holds the purity)", () => {
    const r = catalystGrams({
      catalyst: 'KOH',
      titrant: 'KOH',
      oilLiters: 10,
      baseGramsPerLiter: 7,
      titrationMl: 5,
      purityPct: 85,
      titrantFrom: 'same-catalyst',
    });
    expect(r.gramsPerLiter).toBeCloseTo(7 / 0.85 + 5, 12);
    // the general form (base + T × p_t) ÷ p with p_t = p gives the same
    expect(r.gramsPerLiter).toBeCloseTo((7 + 5 * 0.85) / 0.85, 12);
    expect(r.explanation).toContain("batch's own KOH");
  });

  it('explanation in a US co-op gives gallons and g/gal beside litres (NIST: 1 gal = 3.785411784 L)', () => {
    const r = catalystGrams({
      catalyst: 'KOH',
      oilLiters: 113,
      baseGramsPerLiter: 7,
      titrationMl: 5.0667,
      purityPct: 90,
      titrantFrom: 'same-catalyst',
      system: 'us',
    });
    expect(r.explanation).toContain('29.85 gal (113.0 L)');
    expect(r.explanation).toContain(`${(r.gramsPerLiter * 3.785411784).toFixed(1)} g/gal`);
  });
});

describe("methanol's boiling point at altitude (NIST WebBook Antoine constants; US Standard Atmosphere 1976)", () => {
  it('barometric formula: 101 325 Pa at sea level, ≈ 83.5 kPa at 1 600 m, ≈ 79.5 kPa at 2 000 m', () => {
    expect(pressureAtElevationPa(0)).toBeCloseTo(101_325, 6);
    expect(pressureAtElevationPa(1600) / 1000).toBeCloseTo(83.5, 1);
    expect(pressureAtElevationPa(2000) / 1000).toBeCloseTo(79.5, 1);
  });

  it('Antoine equation at 1 atm ≈ 64.5 °C (NIST), close to the CRC 64.7 °C', () => {
    expect(methanolAntoineBoilingC(101_325)).toBeCloseTo(64.55, 1);
  });

  it('64.7 °C at sea level (CRC), ≈ 59.9 °C at 1 600 m — below the 140 °F (60 °C) warning line', () => {
    expect(methanolBoilingPointC(0)).toBeCloseTo(64.7, 10);
    const at1600 = methanolBoilingPointC(1600);
    expect(at1600).toBeGreaterThan(59.5);
    expect(at1600).toBeLessThan(60.3);
    expect(at1600).toBeLessThan(fToC(140));
  });

  it('a 140 °F reading at 1 600 m is danger, not ok; at sea level it is not even a warning', () => {
    expect(temperatureCheck(fToC(140), 'us').level).toBe('ok');
    const high = temperatureCheck(fToC(140), 'us', { elevationM: 1600 });
    expect(high.level).toBe('danger');
    expect(high.message).toContain('at this elevation');
  });

  it('bands move down by the boiling-point depression; cold never sits above the usual range', () => {
    const b = temperatureBands(3000);
    expect(b.depressionC).toBeCloseTo(64.7 - methanolBoilingPointC(3000), 10);
    expect(b.coldBelowC).toBeLessThanOrEqual(b.usualMinC);
    expect(b.warningAboveC).toBeLessThan(b.boilingC);
  });

  it('the altitude note says boiling starts lower, in the co-op units; none at sea level', () => {
    expect(altitudeNote(0, 'us')).toBeNull();
    expect(altitudeNote(1600, 'us')).toMatch(
      /^At 5,249 ft methanol boils at about 139\.\d °F, not 148\.5 °F: boiling starts lower at altitude/,
    );
    expect(altitudeNote(1600, 'metric')).toMatch(/^At 1,600 m methanol boils at about 59\.\d °C/);
  });

  it('64.69 °C reads as distinct from the boiling point (not "64.7 °C, close to 64.7 °C")', () => {
    const r = temperatureCheck(64.69, 'metric');
    expect(r.level).toBe('warning');
    expect(r.message).toContain('64.69 °C');
    expect(r.message).toContain('(64.70 °C)');
  });
});

describe('yield projection from the co-op history (stoichiometry; common practice)', () => {
  it('ideal ≈ 1.05 L fuel per L oil only when there is no history', () => {
    expect(IDEAL_FUEL_PER_OIL).toBeCloseTo(expectedYields(1, 0.2).fuelLiters, 10);
    expect(IDEAL_FUEL_PER_OIL).toBeCloseTo(1.05, 2);
    const p = projectedFuelYield([]);
    expect(p).toMatchObject({ source: 'ideal', batches: 0 });
    expect(p.ratio).toBe(IDEAL_FUEL_PER_OIL);
  });

  it('median of recent released batches (fuel out ÷ oil in), the ideal shown beside it', () => {
    const p = projectedFuelYield([
      { oilLiters: 100, releasedLiters: 90 },
      { oilLiters: 100, releasedLiters: 85 },
      { oilLiters: 200, releasedLiters: 190 },
      { oilLiters: 0, releasedLiters: 10 }, // ignored
    ]);
    expect(p).toMatchObject({ source: 'history', batches: 3 });
    expect(p.ratio).toBeCloseTo(0.9, 10);
    expect(p.idealRatio).toBeCloseTo(1.05, 2);
    expect(p.explanation).toContain('90.0 %');
  });

  it('crude glycerin layer ≈ 20 % of the oil volume beside ≈ 8 % pure glycerol (common practice; CRC glycerol)', () => {
    const y = expectedYields(100, 20);
    expect(y.glycerolLiters).toBeCloseTo(7.6, 1);
    expect(y.crudeGlycerinLiters).toBeCloseTo(20, 10);
    expect(y.crudeGlycerinRangeLiters).toEqual([15, 25]);
  });
});
