import 'server-only';
import { notFound } from '@/lib/http';
import { PERIOD_PATTERN } from './periods';

/** A 'YYYY-MM' month from the URL; anything else is a 404. */
export function periodParam(s: string): string {
  if (!PERIOD_PATTERN.test(s)) throw notFound('Month not found.');
  return s;
}
