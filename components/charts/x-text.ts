import { formatDate, formatMonth } from '@/lib/dates';

/**
 * A chart's category label in the one date style: a bare calendar date as "Sep 18, 2026", a month
 * 'YYYY-MM' as "Sep 2026", anything else as is.
 */
export function xText(v: unknown): string {
  if (typeof v === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(v)) return formatDate(v, 'UTC');
  if (typeof v === 'string' && /^\d{4}-(0[1-9]|1[0-2])$/.test(v)) return formatMonth(v);
  return String(v ?? '');
}
