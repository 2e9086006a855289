// Verdicts that mean what they say, the completed limits tables and the soap threshold.
// Sources beside each check: ASTM D6751, EN 14214 (rows beyond REFERENCES.md checked against public
// summaries named in lib/quality/astm-d6751.ts and en-14214.ts: an ASTM D6751-09 table, an EN 14214:2012+A1:2014 table),
// IUPAC standard atomic weights; readings marked common practice.
import { describe, expect, it } from 'vitest';
import {
  ALKALI_METAL_MOLAR_MASS_G_PER_MOL,
  QUALITY_LIMITS,
  SOAP_ATTENTION_PPM,
  SOAP_MOLAR_MASS_G_PER_MOL,
  evaluateQuality,
  evaluateQuickTests,
  isLaboratoryResult,
  limitsFor,
  storedVerdictText,
  type QualityResults,
} from '@/lib/quality';

const lab = (value: number, method = 'ASTM D93') => ({
  value,
  method,
  laboratory: 'Valley Fuel Lab',
  date: '2026-11-20',
});
const home = (value: number) => ({ value, method: 'titration', laboratory: 'home test', date: '2026-11-20' });

/** Every required ASTM D6751 (No. 2-B, S15) property, within limits, from a laboratory. */
const fullAstm: QualityResults = {
  acidNumber: lab(0.3, 'ASTM D664'),
  freeGlycerin: lab(0.01),
  totalGlycerin: lab(0.2),
  waterAndSediment: lab(0.02),
  flashPoint: lab(150),
  methanol: lab(0.1),
  kinematicViscosity40C: lab(4.5),
  sulfur: lab(8),
  cloudPoint: lab(2),
  oxidationStability: lab(5),
  sulfatedAsh: lab(0.01),
  copperStripCorrosion: lab(1),
  cetaneNumber: lab(50),
  carbonResidue: lab(0.03),
  sodiumPotassium: lab(2),
  calciumMagnesium: lab(1),
  phosphorus: lab(0.0005),
  distillationT90: lab(345),
  coldSoakFiltration: lab(120),
};

describe('completed limits tables', () => {
  const row = (standard: 'ASTM D6751' | 'EN 14214', property: string, grade?: '1-B' | '2-B') =>
    limitsFor(standard, grade).find((r) => r.property === property);

  it.each([
    ['sodiumPotassium', undefined, 5],
    ['calciumMagnesium', undefined, 5],
    ['phosphorus', undefined, 0.001],
    ['distillationT90', undefined, 360],
    ['coldSoakFiltration', undefined, 360],
  ] as const)(
    'ASTM D6751 %s: min %s, max %s (ASTM D6751 Table 1, public summary of D6751-09)',
    (property, min, max) => {
      const r = row('ASTM D6751', property);
      expect([r?.min, r?.max, r?.required]).toEqual([min, max, true]);
      expect([r?.fromMemory, r?.checkedAgainst]).toEqual([undefined, expect.stringMatching(/ASTM D6751-09/)]);
    },
  );

  it('ASTM D6751 grade No. 1-B (for cold use): cold soak ≤ 200 s and monoglycerides ≤ 0.40 % (ASTM D6751-12 on; a fuel-testing laboratory’s public note on ASTM D7501)', () => {
    expect(row('ASTM D6751', 'coldSoakFiltration', '1-B')?.max).toBe(200);
    expect(row('ASTM D6751', 'monoglycerides', '1-B')?.max).toBe(0.4);
    expect(row('ASTM D6751', 'monoglycerides', '2-B')).toBeUndefined();
    expect(row('ASTM D6751', 'coldSoakFiltration', '1-B')?.source).toMatch(/D6751-12/);
  });

  it.each([
    ['esterContent', 96.5, undefined],
    ['totalContamination', undefined, 24],
    ['monoglycerides', undefined, 0.7],
    ['diglycerides', undefined, 0.2],
    ['triglycerides', undefined, 0.2],
    ['linolenicMethylEster', undefined, 12],
    ['iodineValue', undefined, 120],
    ['phosphorus', undefined, 4],
    ['sodiumPotassium', undefined, 5],
    ['calciumMagnesium', undefined, 5],
  ] as const)(
    'EN 14214 %s: min %s, max %s (EN 14214 Table 1, public table of EN 14214:2012+A1:2014)',
    (property, min, max) => {
      const r = row('EN 14214', property);
      expect([r?.min, r?.max, r?.required, r?.fromMemory]).toEqual([min, max, true, undefined]);
      expect(r?.checkedAgainst).toMatch(/EN 14214:2012\+A1:2014/);
    },
  );

  it('every row names its method and source; rows whose values changed name the edition (EN 14214:2012 oxidation 6 → 8 h, phosphorus 10 → 4 mg/kg)', () => {
    for (const r of QUALITY_LIMITS) {
      expect(r.method, `${r.standard} ${r.property}`).not.toBe('');
      expect(r.source, `${r.standard} ${r.property}`).toMatch(r.standard === 'ASTM D6751' ? /ASTM D6751/ : /EN 14214/);
    }
    expect(row('EN 14214', 'oxidationStability')?.source).toMatch(/6\.0 h before EN 14214:2012/);
    expect(row('EN 14214', 'phosphorus')?.source).toMatch(/10\.0 mg\/kg before EN 14214:2012/);
  });
});

describe('verdicts (ASTM D6751; EN 14214)', () => {
  it('"Meets ASTM D6751" only with every required property from a laboratory within limits', () => {
    const r = evaluateQuality('ASTM D6751', fullAstm);
    expect(r.verdict.text).toBe('Meets ASTM D6751');
    const { coldSoakFiltration: _omit, ...oneShort } = fullAstm;
    expect(evaluateQuality('ASTM D6751', oneShort).verdict.text).toBe(
      'Screened — 18 of 19 required properties tested, none failing',
    );
  });

  it('grade No. 1-B needs the monoglycerides and the 200 s cold soak (ASTM D6751)', () => {
    expect(evaluateQuality('ASTM D6751', fullAstm, { astmGrade: '1-B' }).verdict.kind).toBe('screened');
    const cold = { ...fullAstm, monoglycerides: lab(0.3) };
    expect(evaluateQuality('ASTM D6751', cold, { astmGrade: '1-B' }).verdict.text).toBe('Meets ASTM D6751');
    expect(
      evaluateQuality('ASTM D6751', { ...cold, coldSoakFiltration: lab(250) }, { astmGrade: '1-B' }).verdict.text,
    ).toBe('Fails: Cold soak filtration');
  });

  it('"Fails: <property>" names every failing laboratory result (ASTM D6751 AN ≤ 0.50, flash ≥ 93 °C)', () => {
    const r = evaluateQuality('ASTM D6751', { acidNumber: lab(0.8), flashPoint: lab(80) });
    expect(r.verdict).toMatchObject({ kind: 'fails', text: 'Fails: Acid number, Flash point (closed cup)' });
    expect(r.overall).toBe('fail');
  });

  it('a home test never produces a standard verdict, even in full or out of limits', () => {
    const allHome = Object.fromEntries(
      Object.entries(fullAstm).map(([k, v]) => [k, home((v as { value: number }).value)]),
    );
    const r = evaluateQuality('ASTM D6751', allHome);
    expect(r.verdict.kind).toBe('screened');
    expect(r.verdict.testedCount).toBe(0);
    expect(r.rows.find((x) => x.property === 'acidNumber')?.verdict).toBe('screened-within');
    const high = evaluateQuality('ASTM D6751', { acidNumber: home(0.8) });
    expect(high.verdict.kind).toBe('screened');
    expect(high.verdict.text).toBe(
      'Screened — 0 of 19 required properties tested, none failing; outside the limit in screening: Acid number',
    );
    expect(high.rows[0]).toMatchObject({ verdict: 'screened-outside', laboratory: 'home test', isLaboratory: false });
  });

  it('a bare number, or a result missing its method, laboratory or date, is not a laboratory result', () => {
    expect(isLaboratoryResult(0.3)).toBe(false);
    expect(isLaboratoryResult({ value: 0.3, laboratory: 'Valley Fuel Lab', date: '2026-11-20' })).toBe(false);
    expect(isLaboratoryResult({ value: 0.3, method: 'ASTM D664', laboratory: 'Valley Fuel Lab' })).toBe(false);
    expect(isLaboratoryResult({ value: 0.3, method: 'ASTM D664', laboratory: 'Home Test', date: '2026-11-20' })).toBe(
      false,
    );
    expect(isLaboratoryResult(lab(0.3))).toBe(true);
    const r = evaluateQuality('ASTM D6751', { acidNumber: 0.3 });
    expect(r.rows[0]).toMatchObject({ verdict: 'screened-within', value: 0.3 });
  });

  it('EN 14214 has no flash-point alternative for methanol and needs its own full table', () => {
    const r = evaluateQuality('EN 14214', { flashPoint: lab(140), methanol: lab(0.1) });
    expect(r.verdict.kind).toBe('screened');
    expect(r.verdict.requiredCount).toBe(limitsFor('EN 14214').filter((x) => x.required).length);
  });

  it('a stored verdict reads the same way (never "pass")', () => {
    expect(storedVerdictText('ASTM D6751', 'pass')).toBe('Meets ASTM D6751');
    expect(storedVerdictText('EN 14214', 'incomplete')).toMatch(/^Screened/);
  });
});

describe('soap threshold from Na + K ≤ 5 ppm (ASTM D6751; IUPAC standard atomic weights)', () => {
  it('derivation: ppm soap = 5 × M(oleate) / M(metal) — ≈ 66 ppm as sodium oleate, ≈ 41 ppm as potassium oleate', () => {
    expect(ALKALI_METAL_MOLAR_MASS_G_PER_MOL).toEqual({ NaOH: 22.99, KOH: 39.098 }); // IUPAC
    expect(SOAP_MOLAR_MASS_G_PER_MOL.NaOH).toBeCloseTo(304.44, 2); // C18H33NaO2, IUPAC
    expect(SOAP_ATTENTION_PPM.NaOH).toBeCloseTo((5 * 304.44) / 22.99, 6);
    expect(SOAP_ATTENTION_PPM.NaOH).toBeCloseTo(66.2, 1);
    expect(SOAP_ATTENTION_PPM.KOH).toBeCloseTo(41.0, 1);
  });

  it('304 ppm soap needs attention; 40 ppm is recorded (ASTM D6751-derived threshold)', () => {
    // 1 mL 0.01 N HCl, 10 g sample, NaOH batch → 304 ppm sodium oleate
    const high = evaluateQuickTests({ soap: { hclMl: 1, sampleGrams: 10, catalyst: 'NaOH' } });
    expect(high.items.find((i) => i.test === 'soap')).toMatchObject({ status: 'needs-attention' });
    expect(high.overall).toBe('needs-attention');
    expect(high.items.find((i) => i.test === 'soap')?.detail).toMatch(/above 66 ppm/);
    // 0.125 mL, 10 g, KOH → 40.1 ppm potassium oleate (below 41)
    const low = evaluateQuickTests({ soap: { hclMl: 0.125, sampleGrams: 10, catalyst: 'KOH' } });
    expect(low.items.find((i) => i.test === 'soap')?.status).toBe('recorded');
  });

  it('"clear" after drying is a visual check, never a water result (common practice; EN 14214 water ≤ 500 mg/kg needs a lab)', () => {
    const r = evaluateQuickTests({ water: 'clear' });
    const item = r.items.find((i) => i.test === 'water');
    expect(item?.status).toBe('recorded');
    expect(item?.label).toMatch(/visual/);
    expect(item?.detail).toMatch(/not a water result/);
  });
});

describe('temperatures in the co-op units (NIST SP 811)', () => {
  it('flash and cloud points show °F beside °C in US co-ops', async () => {
    const { formatQualityLimit, formatQualityValue } = await import('@/lib/quality');
    expect(formatQualityValue({ value: 150, unit: '°C' }, 'us')).toBe('150 °C (302 °F)');
    expect(formatQualityValue({ value: -3, unit: '°C' }, 'us')).toBe('-3 °C (26.6 °F)');
    expect(formatQualityValue({ value: 150, unit: '°C' }, 'metric')).toBe('150 °C');
    expect(formatQualityLimit({ limitText: '≥ 93 °C', unit: '°C' }, 'us')).toBe('≥ 93 °C (199.4 °F)');
    expect(formatQualityValue({ value: 0.3, unit: 'mg KOH/g' }, 'us')).toBe('0.3 mg KOH/g');
  });
});
