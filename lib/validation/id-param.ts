import 'server-only';
import { notFound } from '@/lib/http';
import { toId } from './common';

/**
 * THE id parser for URL segments (`/tanks/12`): a strictly positive whole number in decimal digits
 * (see `toId`); anything else is a 404, as a row that is not there would be.
 */
export function idParam(value: string | undefined, what = 'Not found.'): number {
  const id = toId(value);
  if (id === null) throw notFound(what);
  return id;
}
