import { ASTM_S500_SULFUR_MAX_PPM, limitsFor, type FuelStandard, type QualityLimit, type QualityProperty } from './limits';
import { SCREENING_CAUTION } from './screening';

/** Verdict for one property. 'reported' is for properties the standard only asks to report (cloud point). */
export type QualityVerdict = 'pass' | 'fail' | 'not tested' | 'reported';

/** Lab results keyed by property; leave a property out (or undefined) when it was not tested. */
export type QualityResults = Partial<Record<QualityProperty, number | undefined>>;

/** One evaluated row. */
export interface QualityRowResult {
  property: QualityProperty;
  label: string;
  unit: string;
  standard: FuelStandard;
  verdict: QualityVerdict;
  value: number | null;
  limitText: string;
  /** Extra remark (alternative used, grade, from memory …). */
  note?: string;
}

/** Result of {@link evaluateQuality}. */
export interface QualityEvaluation {
  standard: FuelStandard;
  rows: QualityRowResult[];
  /** 'fail' if any row fails; 'pass' if at least one limit was tested and all tested rows pass; else 'incomplete'. */
  overall: 'pass' | 'fail' | 'incomplete';
  /** Rows with a limit that were not tested. */
  untestedCount: number;
  caution: typeof SCREENING_CAUTION;
}

/** Options for {@link evaluateQuality}. */
export interface QualityOptions {
  /** ASTM D6751 sulfur grade; default 'S15' (≤ 15 ppm), 'S500' allows ≤ 500 ppm. */
  astmSulfurGrade?: 'S15' | 'S500';
}

function withinLimit(value: number, row: Pick<QualityLimit, 'min' | 'max'>): boolean {
  return (row.min === undefined || value >= row.min) && (row.max === undefined || value <= row.max);
}

/**
 * Compares lab results with a standard's B100 limits. Values are compared as entered (no
 * rounding). For ASTM D6751 the methanol requirement is also met by a flash point ≥ 130 °C.
 * @param standard 'ASTM D6751' or 'EN 14214'
 * @param results measured values keyed by property (properties the standard has no limit for are ignored)
 * @param options ASTM sulfur grade
 * @returns per-property verdicts, the overall verdict and the caution text
 */
export function evaluateQuality(
  standard: FuelStandard,
  results: QualityResults,
  options: QualityOptions = {},
): QualityEvaluation {
  const rows = limitsFor(standard).map((limit): QualityRowResult => {
    let row: QualityLimit = limit;
    if (standard === 'ASTM D6751' && limit.property === 'sulfur' && options.astmSulfurGrade === 'S500') {
      row = { ...limit, max: ASTM_S500_SULFUR_MAX_PPM, limitText: '≤ 500 ppm (grade S500)', note: undefined };
    }
    const raw = results[row.property];
    if (raw !== undefined && !Number.isFinite(raw)) throw new RangeError(`${row.label}: value must be a number`);
    const base = {
      property: row.property,
      label: row.label,
      unit: row.unit,
      standard,
      value: raw ?? null,
      limitText: row.limitText,
      ...(row.note ? { note: row.note } : {}),
    };
    if (row.reportOnly) return { ...base, verdict: raw === undefined ? 'not tested' : 'reported' };

    if (row.alternative) {
      const altValue = results[row.alternative.property];
      const altMet = altValue !== undefined && Number.isFinite(altValue) && altValue >= row.alternative.min;
      if (raw === undefined && !altMet) return { ...base, verdict: 'not tested' };
      if (raw !== undefined && withinLimit(raw, row)) return { ...base, verdict: 'pass' };
      if (altMet) return { ...base, verdict: 'pass', note: `Met by ${row.alternative.text}.` };
      return { ...base, verdict: 'fail' };
    }
    if (raw === undefined) return { ...base, verdict: 'not tested' };
    return { ...base, verdict: withinLimit(raw, row) ? 'pass' : 'fail' };
  });

  const tested = rows.filter((r) => r.verdict === 'pass' || r.verdict === 'fail');
  const overall = tested.some((r) => r.verdict === 'fail') ? 'fail' : tested.length > 0 ? 'pass' : 'incomplete';
  const reportOnly = new Set(limitsFor(standard).filter((l) => l.reportOnly).map((l) => l.property));
  return {
    standard,
    rows,
    overall,
    untestedCount: rows.filter((r) => r.verdict === 'not tested' && !reportOnly.has(r.property)).length,
    caution: SCREENING_CAUTION,
  };
}
