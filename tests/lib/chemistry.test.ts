import { describe, it, expect } from 'vitest';
import {
  KOH_MOLAR_MASS_G_PER_MOL,
  NAOH_MOLAR_MASS_G_PER_MOL,
  KOH_PER_NAOH,
  METHANOL_MOLAR_MASS_G_PER_MOL,
  GLYCEROL_MOLAR_MASS_G_PER_MOL,
  TRIOLEIN_MOLAR_MASS_G_PER_MOL,
  METHANOL_DENSITY_G_PER_ML,
  METHANOL_BOILING_POINT_C,
  METHANOL_BOILING_POINT_F,
  DEFAULT_BASE_GRAMS_PER_LITER,
  titrationAverage,
  trialsPhrase,
  catalystGrams,
  convertCatalystGrams,
  methanolLiters,
  methanolLitersByPercent,
  methanolLitersByMolarRatio,
  molarRatioFromPercent,
  percentFromMolarRatio,
  acidNumber,
  ffaPercentFromAcidNumber,
  kohEquivalentTitrationMl,
  oilQualityBand,
  temperatureCheck,
  expectedYields,
  YIELD_ASSUMPTIONS,
} from '@/lib/chemistry';
import { fToC } from '@/lib/units';

describe('molar masses and ratio (IUPAC standard atomic weights / CRC Handbook)', () => {
  it('KOH 56.106 and NaOH 39.997 g/mol from atomic weights (IUPAC)', () => {
    // K 39.0983, Na 22.98977, O 15.9994, H 1.00794 (IUPAC standard atomic weights, conventional values)
    expect(KOH_MOLAR_MASS_G_PER_MOL).toBeCloseTo(39.0983 + 15.9994 + 1.00794, 3);
    expect(NAOH_MOLAR_MASS_G_PER_MOL).toBeCloseTo(22.98977 + 15.9994 + 1.00794, 3);
  });

  it('KOH : NaOH = 1.4027 (derived from IUPAC molar masses)', () => {
    // 56.106 / 39.997 = 1.402755…; REFERENCES.md quotes it truncated as 1.4027
    expect(KOH_PER_NAOH).toBeCloseTo(56.106 / 39.997, 12);
    expect(KOH_PER_NAOH).toBeCloseTo(1.4027, 3);
  });

  it('methanol 32.04, glycerol 92.09, triolein 885.4 g/mol (IUPAC / CRC Handbook)', () => {
    expect(METHANOL_MOLAR_MASS_G_PER_MOL).toBe(32.04);
    expect(GLYCEROL_MOLAR_MASS_G_PER_MOL).toBe(92.09);
    expect(TRIOLEIN_MOLAR_MASS_G_PER_MOL).toBe(885.4);
    // triolein C57H104O6 from IUPAC atomic weights C 12.011, H 1.008, O 15.999
    expect(57 * 12.011 + 104 * 1.008 + 6 * 15.999).toBeCloseTo(885.4, 0);
    expect(METHANOL_DENSITY_G_PER_ML).toBe(0.7915); // CRC Handbook
  });

  it('methanol boils at 64.7 °C = 148.5 °F (CRC Handbook; W7 148.46 °F, NIST SP 811)', () => {
    expect(METHANOL_BOILING_POINT_C).toBe(64.7);
    expect(METHANOL_BOILING_POINT_F).toBeCloseTo(148.46, 2);
  });

  it('convertCatalystGrams: 5 g NaOH ≡ 7.01 g KOH and back (common practice; IUPAC)', () => {
    expect(convertCatalystGrams(5, 'NaOH', 'KOH')).toBeCloseTo(7.01, 2);
    expect(convertCatalystGrams(7.0135, 'KOH', 'NaOH')).toBeCloseTo(5, 3);
    expect(convertCatalystGrams(12, 'KOH', 'KOH')).toBe(12);
    expect(convertCatalystGrams(12, 'NaOH', 'NaOH')).toBe(12);
  });

  it('default bases: NaOH 3.5 g/L, KOH 4.91 g/L (common practice; W8)', () => {
    expect(DEFAULT_BASE_GRAMS_PER_LITER.NaOH).toBe(3.5);
    expect(DEFAULT_BASE_GRAMS_PER_LITER.KOH).toBeCloseTo(4.91, 2);
  });
});

describe('titrationAverage (common practice)', () => {
  it('W1: 4.9 / 5.1 / 5.2 mL → average 5.0667 mL, no outliers (common practice worksheet)', () => {
    const r = titrationAverage([4.9, 5.1, 5.2]);
    expect(r.averageMl).toBeCloseTo(5.0667, 4);
    expect(r.trials).toEqual([4.9, 5.1, 5.2]);
    expect(r.outlierIndexes).toEqual([]);
    expect(r.spreadMl).toBeCloseTo(0.3, 10);
    expect(r.averageWithoutOutliersMl).toBeNull();
  });

  it('one trial is allowed and never an outlier', () => {
    const r = titrationAverage([6]);
    expect(r.averageMl).toBe(6);
    expect(r.outlierIndexes).toEqual([]);
    expect(r.spreadMl).toBe(0);
  });

  it("singles out one trial only by Dixon's Q test at 90 % (Dean & Dixon 1951; critical values Rorabacher 1991, from memory)", () => {
    // 10, 10, 11.6: Q = 1.6 / 1.6 = 1 > 0.941 → trial 3
    const r = titrationAverage([10, 10.1, 11.9]);
    expect(r.outlierIndexes).toEqual([2]); // Q = 1.8 / 1.9 = 0.947 > 0.941
    expect(r.averageMl).toBeCloseTo(10.6667, 4); // outliers stay in the average; the brewer decides
    expect(r.averageWithoutOutliersMl).toBeCloseTo(10.05, 10);
    expect(r.notice).toBe(
      "Trial 3 (11.9 mL) stands apart from the others (Dixon's Q test, 90 %): titrate again before relying on the average.",
    );
    // 5.0, 5.1, 6.5: Q = 1.4 / 1.5 = 0.933 < 0.941 — not singled out, but the 1.5 mL spread asks for another titration
    const wide = titrationAverage([5.0, 5.1, 6.5]);
    expect(wide.outlierIndexes).toEqual([]);
    expect(wide.spreadTooWide).toBe(true);
    expect(wide.notice).toMatch(/1\.50 mL apart/);
  });

  it('ordinary scatter is never an outlier: 4.5 / 5.0 / 5.5 flags nothing (changed: the old rule flagged two of these three)', () => {
    const r = titrationAverage([4.5, 5.0, 5.5]);
    expect(r.outlierIndexes).toEqual([]);
    expect(r.spreadTooWide).toBe(false); // 1.0 mL is not more than 1.0 mL (common practice)
    expect(r.notice).toBeNull();
  });

  it('two trials: neither can be singled out; a spread over 1.0 mL asks to titrate again (common practice)', () => {
    const r = titrationAverage([4, 6]);
    expect(r.outlierIndexes).toEqual([]);
    expect(r.averageMl).toBe(5);
    expect(r.spreadTooWide).toBe(true);
    expect(r.averageWithoutOutliersMl).toBeNull();
  });

  it('trial phrases read correctly', () => {
    expect(trialsPhrase([0])).toBe('Trial 1');
    expect(trialsPhrase([0, 2])).toBe('Trials 1 and 3');
    expect(trialsPhrase([0, 1, 2])).toBe('Trials 1, 2 and 3');
  });

  it('subtracts a blank (ASTM D974 uses V − B)', () => {
    expect(titrationAverage([5.2, 5.2, 5.2], 0.2).averageMl).toBeCloseTo(5.0, 10);
    expect(() => titrationAverage([0.1], 0.5)).toThrow(RangeError);
  });

  it('rejects an empty list and bad trials', () => {
    expect(() => titrationAverage([])).toThrow(RangeError);
    expect(() => titrationAverage([5, -1])).toThrow(RangeError);
    expect(() => titrationAverage([5, Number.NaN])).toThrow(RangeError);
  });
});

describe('catalystGrams — purity rule (common practice)', () => {
  it('W1: 113 L, KOH 90 %, base 7, trials 4.9/5.1/5.2 → 12.844 g/L, 1451.4 g (common practice worksheet)', () => {
    const { averageMl } = titrationAverage([4.9, 5.1, 5.2]);
    const r = catalystGrams({
      catalyst: 'KOH',
      oilLiters: 113,
      baseGramsPerLiter: 7,
      titrationMl: averageMl,
      purityPct: 90,
      titrantFrom: 'same-catalyst',
    });
    expect(r.gramsPerLiter).toBeCloseTo(12.844, 3);
    expect(r.totalGrams).toBeCloseTo(1451.4, 1);
    expect(r.rule).toBe('base-over-purity-plus-titration');
    expect(r.explanation).toContain('base ÷ purity + titration');
    expect(r.explanation).toContain('1451.4 g KOH');
  });

  it('W2: NaOH base 3.5 + titration 6.0 → 9.5 g/L (common practice)', () => {
    const r = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 1,
      baseGramsPerLiter: 3.5,
      titrationMl: 6,
      purityPct: 100,
      titrantFrom: 'same-catalyst',
    });
    expect(r.gramsPerLiter).toBeCloseTo(9.5, 10);
    expect(r.totalGrams).toBeCloseTo(9.5, 10);
  });

  it('W3: NaOH titration 3 mL → 6.5 g/L (common practice)', () => {
    const r = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 50,
      baseGramsPerLiter: 3.5,
      titrationMl: 3,
      purityPct: 100,
      titrantFrom: 'same-catalyst',
    });
    expect(r.gramsPerLiter).toBeCloseTo(6.5, 10);
    expect(r.totalGrams).toBeCloseTo(325, 10);
  });

  it('W4: 6 L oil, NaOH 3.8 g/L → 22.8 g NaOH (common practice)', () => {
    const r = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 6,
      baseGramsPerLiter: 3.8,
      titrationMl: 0,
      purityPct: 100,
      titrantFrom: 'same-catalyst',
    });
    expect(r.totalGrams).toBeCloseTo(22.8, 10);
  });

  it('W8: NaOH base 3.5 g/L in KOH → 4.91 pure; 5.46 at 90 %; 5.78 at 85 % (IUPAC molar masses)', () => {
    const base = convertCatalystGrams(3.5, 'NaOH', 'KOH');
    expect(base).toBeCloseTo(4.91, 2);
    const at = (purityPct: number) =>
      catalystGrams({
        catalyst: 'KOH',
        oilLiters: 1,
        baseGramsPerLiter: base,
        titrationMl: 0,
        purityPct,
        titrantFrom: 'same-catalyst',
      }).gramsPerLiter;
    expect(at(100)).toBeCloseTo(4.91, 2);
    expect(at(90)).toBeCloseTo(5.46, 2);
    expect(at(85)).toBeCloseTo(5.78, 2);
  });

  it('titrant from pure reagent: (base + titration) ÷ purity (common practice purity rule)', () => {
    const r = catalystGrams({
      catalyst: 'KOH',
      oilLiters: 113,
      baseGramsPerLiter: 7,
      titrationMl: 5.0667,
      purityPct: 90,
      titrantFrom: 'pure-reagent',
    });
    expect(r.rule).toBe('all-over-purity');
    expect(r.gramsPerLiter).toBeCloseTo((7 + 5.0667) / 0.9, 10); // 13.4074
    expect(r.totalGrams).toBeCloseTo(1515.0, 1);
    expect(r.explanation).toContain('pure reagent');
  });

  it('purity 100 %: both rules give base + titration', () => {
    const same = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 10,
      baseGramsPerLiter: 3.5,
      titrationMl: 2,
      purityPct: 100,
      titrantFrom: 'same-catalyst',
    });
    const pure = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 10,
      baseGramsPerLiter: 3.5,
      titrationMl: 2,
      purityPct: 100,
      titrantFrom: 'pure-reagent',
    });
    expect(same.gramsPerLiter).toBeCloseTo(5.5, 10);
    expect(pure.gramsPerLiter).toBeCloseTo(5.5, 10);
    expect(same.rule).not.toBe(pure.rule); // the rule applied is still shown
  });

  it('NaOH vs KOH: the same oil needs 1.4027 × the NaOH grams as KOH (IUPAC)', () => {
    const naoh = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 100,
      baseGramsPerLiter: 3.5,
      titrationMl: 4,
      purityPct: 100,
      titrantFrom: 'same-catalyst',
    });
    const koh = catalystGrams({
      catalyst: 'KOH',
      oilLiters: 100,
      baseGramsPerLiter: DEFAULT_BASE_GRAMS_PER_LITER.KOH,
      titrationMl: kohEquivalentTitrationMl(4, 'NaOH'),
      purityPct: 100,
      titrantFrom: 'same-catalyst',
    });
    expect(koh.totalGrams / naoh.totalGrams).toBeCloseTo(KOH_PER_NAOH, 10); // ≈ 1.4027
  });

  it('rejects purity 0, negative or above 100 %, and negative amounts', () => {
    const base = {
      catalyst: 'KOH' as const,
      oilLiters: 10,
      baseGramsPerLiter: 7,
      titrationMl: 5,
      titrantFrom: 'same-catalyst' as const,
    };
    expect(() => catalystGrams({ ...base, purityPct: 0 })).toThrow(RangeError);
    expect(() => catalystGrams({ ...base, purityPct: -5 })).toThrow(RangeError);
    expect(() => catalystGrams({ ...base, purityPct: 100.1 })).toThrow(RangeError);
    expect(() => catalystGrams({ ...base, purityPct: Number.NaN })).toThrow(RangeError);
    expect(() => catalystGrams({ ...base, purityPct: 90, oilLiters: -1 })).toThrow(RangeError);
    expect(() => catalystGrams({ ...base, purityPct: 90, titrationMl: -1 })).toThrow(RangeError);
  });
});

describe('methanol (stoichiometry with CRC values; common practice)', () => {
  it('W4: 6 L oil at 200 mL/L → 1.2 L methanol (common practice)', () => {
    expect(methanolLitersByPercent(6, 20)).toBeCloseTo(1.2, 10);
    expect(methanolLitersByPercent(6)).toBeCloseTo(1.2, 10); // 20 % default, common practice
    expect(methanolLiters.byPercent(113)).toBeCloseTo(22.6, 10);
  });

  it('W5: 3:1 → ≈ 126 mL per L oil; 6:1 → ≈ 252 mL/L (stoichiometry with CRC values)', () => {
    expect(methanolLitersByMolarRatio(1, 3) * 1000).toBeCloseTo(126, 0); // 126.2
    expect(methanolLitersByMolarRatio(1, 6) * 1000).toBeCloseTo(252, 0); // 252.4
    expect(methanolLiters.byMolarRatio(100, 6)).toBeCloseTo(25.24, 1);
    expect(percentFromMolarRatio(3)).toBeCloseTo(12.6, 1); // REFERENCES: stoichiometric ≈ 12.6 % v/v
  });

  it('W5: 200 mL/L ≈ 4.75:1 (stoichiometry with CRC values)', () => {
    expect(molarRatioFromPercent(20)).toBeCloseTo(4.75, 2);
    expect(molarRatioFromPercent(percentFromMolarRatio(6))).toBeCloseTo(6, 10);
  });

  it('honours a different oil density and molar mass', () => {
    const heavier = methanolLitersByMolarRatio(1, 6, { oilDensityGPerMl: 0.923 });
    expect(heavier).toBeGreaterThan(methanolLitersByMolarRatio(1, 6));
    expect(() => methanolLitersByMolarRatio(1, 6, { oilDensityGPerMl: 0 })).toThrow(RangeError);
    expect(() => methanolLitersByPercent(-1)).toThrow(RangeError);
  });
});

describe('acid number and FFA (ASTM D974 definition; AOCS Ca 5a-40)', () => {
  it('W6: KOH titrant, T = 4 mL, 0.92 g/mL → AN 4.35 mg KOH/g, FFA 2.19 % (ASTM D974; AOCS Ca 5a-40)', () => {
    const an = acidNumber({ titrationMl: 4, titrant: 'KOH' });
    expect(an).toBeCloseTo(4.35, 2);
    expect(ffaPercentFromAcidNumber(an)).toBeCloseTo(2.19, 2);
  });

  it('FFA % ≈ AN / 1.99 (AOCS Ca 5a-40)', () => {
    expect(ffaPercentFromAcidNumber(1.99)).toBeCloseTo(1, 2);
    expect(ffaPercentFromAcidNumber(0)).toBe(0);
    expect(() => ffaPercentFromAcidNumber(-1)).toThrow(RangeError);
  });

  it('NaOH titrant is multiplied by 1.4027 (IUPAC molar masses; ASTM D974 definition)', () => {
    expect(acidNumber({ titrationMl: 4, titrant: 'NaOH' })).toBeCloseTo((4 * 1.4027) / 0.92, 3); // 6.10
    expect(acidNumber({ titrationMl: 4, titrant: 'KOH', oilDensityGPerMl: 0.9 })).toBeCloseTo(4.444, 3);
    expect(() => acidNumber({ titrationMl: 4, titrant: 'KOH', oilDensityGPerMl: 0 })).toThrow(RangeError);
  });
});

describe('oilQualityBand (common practice bands)', () => {
  it.each([
    [0, 'good'],
    [4, 'good'],
    [4.01, 'average'],
    [5, 'average'],
    [7, 'average'],
    [7.5, 'poor'],
    [10, 'poor'],
    [10.5, 'very-poor'],
    [18, 'very-poor'],
    [18.1, 'reject'],
  ] as const)('%s mL KOH-equivalent → %s (common practice)', (ml, band) => {
    expect(oilQualityBand(ml).band).toBe(band);
  });

  it('acid pre-treatment advised from "poor" on (common practice)', () => {
    expect(oilQualityBand(7).needsAcidPretreatment).toBe(false);
    expect(oilQualityBand(8).needsAcidPretreatment).toBe(true);
    expect(oilQualityBand(20).reject).toBe(true);
  });

  it('FFA above 5 % also flags pre-treatment (common practice, university extension notes)', () => {
    // a light oil: 7 mL at 0.7 g/mL → AN 10, FFA 5.03 % while the band is only "average"
    const r = oilQualityBand(7, 0.7);
    expect(r.band).toBe('average');
    expect(r.ffaPercent).toBeGreaterThan(5);
    expect(r.needsAcidPretreatment).toBe(true);
    expect(r.message).toMatch(/pre-treatment/);
  });

  it('W6 as a band: 4 mL → good, AN 4.35, FFA 2.19 % (ASTM D974; AOCS Ca 5a-40)', () => {
    const r = oilQualityBand(4);
    expect(r.band).toBe('good');
    expect(r.acidNumberMgKohPerG).toBeCloseTo(4.35, 2);
    expect(r.ffaPercent).toBeCloseTo(2.19, 2);
  });

  it('NaOH titration 5 mL is 7.01 mL KOH-equivalent → poor (IUPAC; common practice)', () => {
    expect(oilQualityBand(kohEquivalentTitrationMl(5, 'NaOH')).band).toBe('poor');
  });
});

describe('temperatureCheck (common practice range; CRC Handbook boiling point)', () => {
  it('W7: 55 °C (131 °F) is within the usual 130–135 °F range', () => {
    const r = temperatureCheck(55);
    expect(r.level).toBe('ok');
    expect(r.withinUsualRange).toBe(true);
    expect(r.message).toContain('within the usual range');
  });

  it('W7: 130 °F = 54.44 °C is the lower edge of the usual range (NIST SP 811)', () => {
    expect(temperatureCheck(fToC(130)).withinUsualRange).toBe(true);
    expect(temperatureCheck(fToC(135)).withinUsualRange).toBe(true);
    expect(temperatureCheck(fToC(129)).withinUsualRange).toBe(false);
  });

  it('below 120 °F is cold (common practice); 120 °F exactly is not', () => {
    expect(temperatureCheck(fToC(119.9)).level).toBe('cold');
    expect(temperatureCheck(fToC(120)).level).toBe('ok');
    expect(temperatureCheck(fToC(120)).message).toContain('below the usual range');
    expect(temperatureCheck(20).message).toContain('slow');
  });

  it('140 °F exactly is not a warning; above 140 °F is (common practice)', () => {
    const at140 = temperatureCheck(fToC(140));
    expect(at140.level).toBe('ok');
    expect(at140.message).toContain('above the usual range');
    expect(temperatureCheck(60).level).toBe('ok'); // 60 °C = 140 °F
    expect(temperatureCheck(fToC(140.1)).level).toBe('warning');
    expect(temperatureCheck(fToC(145)).level).toBe('warning');
  });

  it('64.7 °C exactly and 148.5 °F are danger; just below is a warning (CRC Handbook)', () => {
    expect(temperatureCheck(64.7).level).toBe('danger');
    expect(temperatureCheck(fToC(148.5)).level).toBe('danger');
    expect(temperatureCheck(fToC(148.46)).level).toBe('danger'); // W7: 64.7 °C = 148.46 °F
    expect(temperatureCheck(64.69).level).toBe('warning');
    expect(temperatureCheck(80).message).toContain('boiling point');
  });

  it('never calls a reading safe, in either unit system', () => {
    for (const c of [-10, 20, 49, 55, 58, 60, 62, 64.7, 90]) {
      for (const system of ['us', 'metric'] as const) {
        expect(temperatureCheck(c, system).message.toLowerCase()).not.toContain('safe');
      }
    }
    expect(temperatureCheck(55, 'metric').message).toContain('°C');
    expect(temperatureCheck(55, 'us').message).toContain('°F');
  });

  it('rejects non-numbers', () => {
    expect(() => temperatureCheck(Number.NaN)).toThrow(RangeError);
  });
});

describe('expectedYields (stoichiometry; CRC Handbook; US DOE AFDC density)', () => {
  it('1 L oil with 20 % methanol → ≈ 10 % of oil mass as glycerol, ≈ 1.05 L fuel', () => {
    const y = expectedYields(1, 0.2);
    expect(y.conversionFraction).toBe(1);
    // glycerol: 920 g ÷ 885.4 × 92.09 = 95.69 g ≈ 10.4 % of oil mass (stoichiometry)
    expect(y.glycerolKg).toBeCloseTo(0.09569, 4);
    expect(y.glycerolKg / 0.92).toBeCloseTo(0.104, 3);
    expect(y.glycerolLiters).toBeCloseTo(0.09569 / 1.261, 4); // CRC Handbook density
    // methanol reacted = 3:1 = 126.2 mL; excess 73.8 mL (W5)
    expect(y.methanolReactedLiters).toBeCloseTo(0.1262, 3);
    expect(y.excessMethanolLiters).toBeCloseTo(0.0738, 3);
    // fuel mass = 920 + 99.88 − 95.69 = 924.2 g; ÷ 0.88 kg/L (US DOE AFDC)
    expect(y.fuelKg).toBeCloseTo(0.9242, 3);
    expect(y.fuelLiters).toBeCloseTo(1.05, 2);
    expect(y.assumptions).toBe(YIELD_ASSUMPTIONS);
  });

  it('W1 batch: 113 L oil → ≈ 118.7 L fuel before washing losses', () => {
    const y = expectedYields(113, methanolLitersByPercent(113));
    expect(y.fuelLiters).toBeCloseTo(118.7, 0);
  });

  it('too little methanol limits conversion in proportion', () => {
    const half = expectedYields(1, methanolLitersByMolarRatio(1, 1.5));
    expect(half.conversionFraction).toBeCloseTo(0.5, 10);
    expect(half.excessMethanolLiters).toBeCloseTo(0, 10);
    expect(expectedYields(0, 0).fuelLiters).toBe(0);
    expect(() => expectedYields(-1, 0)).toThrow(RangeError);
  });
});

describe('catalystGrams explanation text', () => {
  it('shows the purity used and the total', () => {
    const r = catalystGrams({
      catalyst: 'NaOH',
      oilLiters: 6,
      baseGramsPerLiter: 3.8,
      titrationMl: 0,
      purityPct: 97.5,
      titrantFrom: 'pure-reagent',
    });
    expect(r.explanation).toContain('0.975 (97.5 % purity)');
    expect(r.totalGrams).toBeCloseTo(23.3846, 4); // 3.8 ÷ 0.975 × 6
  });
});
