import { ASTM_D6751_LIMITS } from './astm-d6751';
import { EN_14214_LIMITS } from './en-14214';
import type { AstmGrade, FuelStandard, QualityLimit } from './standards';

/**
 * Finished fuel (B100) limits. The first rows of each standard are those in
 * /work/shared/REFERENCES.md "Finished fuel limits (B100)"; the rows after them complete the
 * standards' tables and name the public summary they were checked against (`checkedAgainst`); a
 * value no public document confirmed is marked `fromMemory`. Every row names its source, and its edition
 * where values changed between editions.
 */
export const QUALITY_LIMITS: readonly QualityLimit[] = [...ASTM_D6751_LIMITS, ...EN_14214_LIMITS];

/**
 * The limit rows of one standard, in table order (for ASTM D6751, of one grade; No. 2-B by default).
 * @param standard 'ASTM D6751' or 'EN 14214'
 * @param astmGrade ASTM D6751 grade, '2-B' unless the fuel is for cold use ('1-B')
 * @returns the rows of that standard
 */
export function limitsFor(standard: FuelStandard, astmGrade: AstmGrade = '2-B'): QualityLimit[] {
  return QUALITY_LIMITS.filter(
    (row) => row.standard === standard && (row.astmGrade === undefined || row.astmGrade === astmGrade),
  );
}
