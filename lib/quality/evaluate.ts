import { ASTM_S500_SULFUR_MAX_PPM } from './astm-d6751';
import { limitsFor } from './limits';
import type { AstmGrade, FuelStandard, QualityLimit, QualityProperty } from './standards';
import { SCREENING_CAUTION } from './screening';

/**
 * Verdict for one property. 'pass'/'fail' only for laboratory results; a home test or a value
 * without its laboratory, method and date is 'screened-within' / 'screened-outside' — it never
 * earns the standard's name. 'reported' is for properties the standard only asks to report.
 */
export type QualityVerdict = 'pass' | 'fail' | 'not tested' | 'reported' | 'screened-within' | 'screened-outside';

/** The laboratory name recorded for a test done at home. */
export const HOME_TEST_LABORATORY = 'home test';

/** One recorded result with where it comes from. */
export interface LabResult {
  value: number;
  /** Test method, e.g. "ASTM D93". */
  method?: string | null;
  /** Laboratory name, or "home test". */
  laboratory?: string | null;
  /** Date tested, YYYY-MM-DD. */
  date?: string | null;
}

/**
 * Results keyed by property; leave a property out (or undefined) when it was not tested. A bare
 * number is a value of unknown provenance (screening only).
 */
export type QualityResults = Partial<Record<QualityProperty, number | LabResult | undefined | null>>;

/** True when a result names a laboratory (not "home test"), a method and a date: only these can meet or fail a standard. */
export function isLaboratoryResult(result: number | LabResult | undefined | null): result is LabResult {
  if (result === undefined || result === null || typeof result === 'number') return false;
  const lab = result.laboratory?.trim() ?? '';
  return (
    lab !== '' &&
    lab.toLowerCase() !== HOME_TEST_LABORATORY &&
    (result.method?.trim() ?? '') !== '' &&
    /^\d{4}-\d{2}-\d{2}$/.test(result.date ?? '')
  );
}

/** One evaluated row. */
export interface QualityRowResult {
  property: QualityProperty;
  label: string;
  unit: string;
  standard: FuelStandard;
  verdict: QualityVerdict;
  value: number | null;
  limitText: string;
  /** Method the standard names. */
  standardMethod: string;
  /** Where the row's limit comes from. */
  source: string;
  /** Needed for a "meets" verdict. */
  required: boolean;
  /** The result's provenance, when one was recorded. */
  method: string | null;
  laboratory: string | null;
  date: string | null;
  /** True for a laboratory result (method, laboratory and date given; not a home test). */
  isLaboratory: boolean;
  /** Extra remark (alternative used, grade, from memory …). */
  note?: string;
}

/** The one verdict the app shows for a batch's quality, everywhere. */
export interface StandardVerdict {
  kind: 'meets' | 'fails' | 'screened';
  /** "Meets ASTM D6751", "Fails: Acid number, Flash point (closed cup)", or "Screened — 3 of 19 required properties tested, none failing". */
  text: string;
  /** Required properties with a laboratory result. */
  testedCount: number;
  requiredCount: number;
  /** Labels of properties whose laboratory result is outside the limit. */
  failing: string[];
  /** Labels of properties whose home or unattributed result is outside the limit. */
  screenedOutside: string[];
}

/** Result of {@link evaluateQuality}. */
export interface QualityEvaluation {
  standard: FuelStandard;
  rows: QualityRowResult[];
  /** 'pass' only when the standard is met in full ({@link StandardVerdict} kind 'meets'); 'fail' on a failing laboratory result; else 'incomplete'. */
  overall: 'pass' | 'fail' | 'incomplete';
  verdict: StandardVerdict;
  /** Required rows without a laboratory result. */
  untestedCount: number;
  caution: typeof SCREENING_CAUTION;
}

/** Options for {@link evaluateQuality}. */
export interface QualityOptions {
  /** ASTM D6751 sulfur grade; default 'S15' (≤ 15 ppm), 'S500' allows ≤ 500 ppm. */
  astmSulfurGrade?: 'S15' | 'S500';
  /** ASTM D6751 grade; default '2-B'; '1-B' (for cold use) adds cold soak ≤ 200 s and monoglycerides. */
  astmGrade?: AstmGrade;
}

function withinLimit(value: number, row: Pick<QualityLimit, 'min' | 'max'>): boolean {
  return (row.min === undefined || value >= row.min) && (row.max === undefined || value <= row.max);
}

function valueOf(result: number | LabResult | undefined | null): number | undefined {
  if (result === undefined || result === null) return undefined;
  const v = typeof result === 'number' ? result : result.value;
  if (!Number.isFinite(v)) throw new RangeError('value must be a number');
  return v;
}

/**
 * Compares results with a standard's B100 limits and gives the one verdict the app shows:
 * - "Meets <standard>" only when every required property has a laboratory result within
 *   its limit (report-only rows: a laboratory value reported);
 * - "Fails: <properties>" when a laboratory result is outside its limit;
 * - otherwise "Screened — n of m required properties tested, none failing".
 * Home tests and values without laboratory, method and date are shown against the limit but
 * never produce a standard verdict. Values are compared as entered (no rounding). For ASTM
 * D6751 the methanol requirement is also met by a laboratory flash point ≥ 130 °C.
 * @param standard 'ASTM D6751' or 'EN 14214'
 * @param results measured values (or results with provenance) keyed by property
 * @param options ASTM grade and sulfur grade
 * @returns per-property verdicts, the overall verdict and the caution text
 */
export function evaluateQuality(
  standard: FuelStandard,
  results: QualityResults,
  options: QualityOptions = {},
): QualityEvaluation {
  const rows = limitsFor(standard, options.astmGrade ?? '2-B').map((limit): QualityRowResult => {
    let row: QualityLimit = limit;
    if (standard === 'ASTM D6751' && limit.property === 'sulfur' && options.astmSulfurGrade === 'S500') {
      row = { ...limit, max: ASTM_S500_SULFUR_MAX_PPM, limitText: '≤ 500 ppm (grade S500)', note: undefined };
    }
    const result = results[row.property];
    let raw: number | undefined;
    try {
      raw = valueOf(result);
    } catch {
      throw new RangeError(`${row.label}: value must be a number`);
    }
    const lab = isLaboratoryResult(result);
    const meta = typeof result === 'object' && result !== null ? result : null;
    const base = {
      property: row.property,
      label: row.label,
      unit: row.unit,
      standard,
      value: raw ?? null,
      limitText: row.limitText,
      standardMethod: row.method,
      source: row.source,
      required: row.required,
      method: meta?.method?.trim() || null,
      laboratory: meta?.laboratory?.trim() || null,
      date: meta?.date ?? null,
      isLaboratory: lab,
      ...(row.note ? { note: row.note } : {}),
    };
    const judged = (ok: boolean): QualityVerdict =>
      lab ? (ok ? 'pass' : 'fail') : ok ? 'screened-within' : 'screened-outside';

    if (row.reportOnly) return { ...base, verdict: raw === undefined ? 'not tested' : 'reported' };
    if (row.alternative) {
      const alt = results[row.alternative.property];
      const altValue = valueOf(alt);
      const altMet = altValue !== undefined && altValue >= row.alternative.min;
      const altLab = isLaboratoryResult(alt);
      if (raw === undefined && !altMet) return { ...base, verdict: 'not tested' };
      if (raw !== undefined && withinLimit(raw, row) && (lab || !(altMet && altLab)))
        return { ...base, verdict: judged(true) };
      if (altMet) {
        return {
          ...base,
          verdict: altLab ? 'pass' : 'screened-within',
          isLaboratory: altLab,
          note: `Met by ${row.alternative.text}.`,
        };
      }
      return { ...base, verdict: judged(false) };
    }
    if (raw === undefined) return { ...base, verdict: 'not tested' };
    return { ...base, verdict: judged(withinLimit(raw, row)) };
  });

  const required = rows.filter((r) => r.required);
  const labDone = (r: QualityRowResult) =>
    r.isLaboratory && (r.verdict === 'pass' || r.verdict === 'fail' || r.verdict === 'reported');
  const testedCount = required.filter(labDone).length;
  const failing = rows.filter((r) => r.verdict === 'fail').map((r) => r.label);
  const screenedOutside = rows.filter((r) => r.verdict === 'screened-outside').map((r) => r.label);
  const meets = failing.length === 0 && required.every((r) => labDone(r) && r.verdict !== 'fail');
  const verdict: StandardVerdict = {
    kind: failing.length ? 'fails' : meets ? 'meets' : 'screened',
    text: failing.length
      ? `Fails: ${failing.join(', ')}`
      : meets
        ? `Meets ${standard}`
        : `Screened — ${testedCount} of ${required.length} required properties tested, none failing${screenedOutside.length ? `; outside the limit in screening: ${screenedOutside.join(', ')}` : ''}`,
    testedCount,
    requiredCount: required.length,
    failing,
    screenedOutside,
  };
  return {
    standard,
    rows,
    overall: verdict.kind === 'meets' ? 'pass' : verdict.kind === 'fails' ? 'fail' : 'incomplete',
    verdict,
    untestedCount: required.length - testedCount,
    caution: SCREENING_CAUTION,
  };
}

/**
 * The verdict text for a stored overall verdict when the rows are not at hand (e.g. a list):
 * never "pass" — 'pass' is shown as "Meets <standard>".
 */
export function storedVerdictText(standard: FuelStandard, overall: 'pass' | 'fail' | 'incomplete'): string {
  return overall === 'pass'
    ? `Meets ${standard}`
    : overall === 'fail'
      ? 'Fails a laboratory test'
      : 'Screened — not every required property tested';
}
