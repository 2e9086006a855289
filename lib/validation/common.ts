import { z } from 'zod';
import { isTimeZone } from '@/lib/dates';

// Building blocks shared by every domain's schemas: ids, text without control characters, time
// zones. One definition each, so every route judges the same input the same way.

// In the browser, zod would probe `new Function` to speed up object parsing; under the app's
// Content-Security-Policy (no 'unsafe-eval') the probe is refused and reported as a violation.
// Every schema module imports this one, so the setting is in place before any schema is built.
if (typeof window !== 'undefined') z.config({ jitless: true });

/** The largest id a PostgreSQL INTEGER column holds. */
export const MAX_ID = 2_147_483_647;

/**
 * A strictly positive whole id from a JSON number or from decimal digits in text ("12"); never a
 * boolean, hex ("0x10"), exponent ("1e3"), sign, fraction or padding — `Number()` and
 * `z.coerce` accept all of those. Returns null for anything else.
 */
export function toId(value: unknown): number | null {
  if (typeof value === 'number') return Number.isInteger(value) && value >= 1 && value <= MAX_ID ? value : null;
  if (typeof value !== 'string' || !/^[1-9]\d{0,9}$/.test(value)) return null;
  const n = Number(value);
  return n <= MAX_ID ? n : null;
}

/** An id in a body or query (see `toId`); `message` is shown beside the field. */
export const idSchema = (message = 'Choose one.') =>
  z.unknown().transform((v, ctx) => {
    const id = toId(v);
    if (id === null) {
      ctx.addIssue({ code: 'custom', message });
      return z.NEVER;
    }
    return id;
  });

/** C0 control characters and DEL, except tab, line feed and carriage return. */
export const CONTROL_CHARS = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
/** As CONTROL_CHARS, also refusing tab and line breaks (one-line fields: names, titles). */
export const CONTROL_CHARS_ONE_LINE = /[\u0000-\u001f\u007f]/;

/**
 * Text as a person types it: trimmed, at most `max` characters, and no control characters (a NUL
 * can't be stored in PostgreSQL text or jsonb; the others are never typed). `multiline` lets tabs
 * and line breaks through.
 */
export const textSchema = (max: number, opts: { multiline?: boolean; min?: number; what?: string } = {}) =>
  z
    .string({ error: `Enter ${opts.what ?? 'some text'}.` })
    .trim()
    .min(opts.min ?? 0, opts.min ? `At least ${opts.min} character${opts.min === 1 ? '' : 's'}.` : undefined)
    .max(max, `At most ${max} characters.`)
    .refine(
      (s) => !(opts.multiline ? CONTROL_CHARS : CONTROL_CHARS_ONE_LINE).test(s),
      'Remove the control characters from this text.',
    );

/** An IANA time-zone name, checked against the runtime's own time-zone data. */
export const timeZoneSchema = z
  .string({ error: 'Choose a time zone.' })
  .trim()
  .max(60, 'Not a time zone name such as America/Chicago.')
  .refine(isTimeZone, 'Not a time zone name such as America/Chicago.');
