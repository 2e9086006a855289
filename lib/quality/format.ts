import { cToF, type UnitSystem } from '../units';
import type { QualityRowResult } from './evaluate';

/** °F with one decimal for a °C figure (NIST SP 811: °F = °C × 1.8 + 32). */
const f = (c: number) => `${Number(cToF(c).toFixed(1))} °F`;

/**
 * A result as shown on screens and PDFs: temperatures in °C (as the standards state them) with
 * °F beside them in US co-ops, e.g. "150 °C (302 °F)".
 * @param row an evaluated row
 * @param units the co-op's unit system
 */
export function formatQualityValue(row: Pick<QualityRowResult, 'value' | 'unit'>, units: UnitSystem): string {
  if (row.value === null) return '—';
  if (row.unit === '°C') return units === 'us' ? `${row.value} °C (${f(row.value)})` : `${row.value} °C`;
  return `${row.value}${row.unit ? ` ${row.unit}` : ''}`;
}

/**
 * A limit as shown: temperature limits get °F beside them in US co-ops, e.g. "≥ 93 °C (199.4 °F)".
 * @param row an evaluated row
 * @param units the co-op's unit system
 */
export function formatQualityLimit(row: Pick<QualityRowResult, 'limitText' | 'unit'>, units: UnitSystem): string {
  if (row.unit !== '°C' || units !== 'us') return row.limitText;
  return row.limitText.replace(/(-?\d+(?:\.\d+)?) °C/g, (_, n: string) => `${n} °C (${f(Number(n))})`);
}
