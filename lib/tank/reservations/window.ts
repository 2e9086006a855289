import { zonedToUtc } from '@/lib/dates';

/**
 * A reservation's time window from what a member typed (pure). Dates are calendar days in the
 * co-op's time zone: "from 2026-12-03 to 2026-12-05" runs from 00:00 on the 3rd to 24:00 on the
 * 5th there. A date-time ("2026-12-03T17:30") is read in the co-op's zone; an ISO instant with
 * Z or an offset is taken as is.
 */

export type WindowResult = { ok: true; start: Date; end: Date } | { ok: false; fields: Record<string, string[]> };

/** Longest window a member may hold fuel for. */
export const MAX_WINDOW_DAYS = 60;

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const LOCAL = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.\d{1,3})?)?$/;

function validDay(y: number, m: number, d: number) {
  const t = new Date(Date.UTC(y, m - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
}

/**
 * Reads one end of the window.
 * @param text what was typed
 * @param timeZone the co-op's IANA zone
 * @param endOfDay for a bare date, take the end of that day (24:00) instead of its start
 * @returns the instant, or null when the text is not a date
 */
export function parseWindowEdge(text: string, timeZone: string, endOfDay: boolean): Date | null {
  const s = text.trim();
  let m = DATE.exec(s);
  if (m) {
    const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
    if (!validDay(y, mo, d)) return null;
    if (!endOfDay) return zonedToUtc(y, mo, d, 0, 0, timeZone);
    const next = new Date(Date.UTC(y, mo - 1, d + 1));
    return zonedToUtc(next.getUTCFullYear(), next.getUTCMonth() + 1, next.getUTCDate(), 0, 0, timeZone);
  }
  m = LOCAL.exec(s);
  if (m) {
    const [y, mo, d, h, mi, sec] = [
      Number(m[1]),
      Number(m[2]),
      Number(m[3]),
      Number(m[4]),
      Number(m[5]),
      Number(m[6] ?? 0),
    ];
    if (!validDay(y, mo, d) || h > 23 || mi > 59 || sec > 59) return null;
    return new Date(zonedToUtc(y, mo, d, h, mi, timeZone).getTime() + sec * 1000);
  }
  if (/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:?\d{2})$/i.test(s)) {
    const t = new Date(s);
    return Number.isNaN(t.getTime()) ? null : t;
  }
  return null;
}

/**
 * The reservation window, or the field errors a form shows: each end must be a date, the end
 * must come after the start and after now, and the window may not exceed {@link MAX_WINDOW_DAYS}.
 */
export function reservationWindow(
  startText: string,
  endText: string,
  timeZone: string,
  now = new Date(),
): WindowResult {
  const fields: Record<string, string[]> = {};
  const start = parseWindowEdge(startText, timeZone, false);
  const end = parseWindowEdge(endText, timeZone, true);
  if (!start) fields.windowStart = ['Enter a start date such as 2026-12-03.'];
  if (!end) fields.windowEnd = ['Enter an end date such as 2026-12-05.'];
  if (start && end) {
    if (end.getTime() <= start.getTime()) fields.windowEnd = ['The window must end after it starts.'];
    else if (end.getTime() <= now.getTime())
      fields.windowEnd = ['That window has already ended; pick a later end date.'];
    else if (end.getTime() - start.getTime() > MAX_WINDOW_DAYS * 86_400_000)
      fields.windowEnd = [`A reservation can run at most ${MAX_WINDOW_DAYS} days.`];
  }
  if (Object.keys(fields).length > 0 || !start || !end) return { ok: false, fields };
  return { ok: true, start, end };
}

/**
 * A date-time typed in a form (read in the co-op's zone) or an ISO instant.
 * @returns the instant, or null when the text is not a date-time
 */
export function parseInstant(text: string, timeZone: string): Date | null {
  return /T/.test(text) ? parseWindowEdge(text, timeZone, false) : null;
}
