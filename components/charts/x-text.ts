import { formatDate } from '@/lib/dates';

/** A chart's category label: a bare calendar date in the one date style ("Sep 18, 2026"), anything else as is. */
export function xText(v: unknown): string {
  return typeof v === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(v) ? formatDate(v, 'UTC') : String(v ?? '');
}
