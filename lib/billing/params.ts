import 'server-only';
import { notFound } from '@/lib/http';
import { PERIOD_PATTERN } from './periods';

/** A numeric id from the URL; anything else is a 404 (the row cannot exist). */
export function idParam(s: string): number {
  if (!/^[1-9]\d{0,9}$/.test(s) || Number(s) > 2_147_483_647) throw notFound();
  return Number(s);
}

/** A 'YYYY-MM' month from the URL; anything else is a 404. */
export function periodParam(s: string): string {
  if (!PERIOD_PATTERN.test(s)) throw notFound('Month not found.');
  return s;
}
