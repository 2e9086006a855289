import 'server-only';
import { notFound } from '@/lib/http';

/** A numeric id from a URL segment; anything else is a 404 (as an unknown id would be). */
export function idParam(value: string | undefined, what = 'Not found.'): number {
  if (!value || !/^[1-9]\d{0,8}$/.test(value)) throw notFound(what);
  return Number(value);
}
