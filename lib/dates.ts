import { tz, TZDate } from '@date-fns/tz';
import { format } from 'date-fns';

/**
 * The one way to show dates and times: always in the co-op's time zone, always in one shape —
 * "Dec 3, 2026" for a day, "Dec 3, 2026, 17:30" for a moment, "17:30" for a time of day (24-hour
 * clock). Built with date-fns in the zone (@date-fns/tz), so the server and the browser render the
 * same text whatever their own zone (pure; safe in client components and e-mails). Calendar days
 * in a zone (today, a moment's day) and wall-clock times in a zone come from here too.
 *
 * A bare calendar date ("2026-12-03": a batch date, a due date) is a day, not a moment, and is
 * shown as that day in every zone.
 */
const DAY_ONLY = /^\d{4}-\d{2}-\d{2}$/;

/** Whether the runtime knows `name` as an IANA time zone (America/Chicago, Europe/Berlin, UTC). */
export function isTimeZone(name: string): boolean {
  // Names only (Area/Location, UTC, Etc/GMT+5): the database resolves the same names, while the
  // offsets some runtimes also accept ("+05:00") mean something else to it.
  if (name.length > 60 || !/^[A-Za-z][A-Za-z0-9_+-]*(?:\/[A-Za-z0-9_+-]+){0,2}$/.test(name)) return false;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

/** The zone name when it is one (cached), else 'UTC': a mistyped zone in a
 * co-op's settings must never stop a page or an e-mail. */
const known = new Map<string, string>();
function safeZone(timeZone: string): string {
  let z = known.get(timeZone);
  if (!z) known.set(timeZone, (z = isTimeZone(timeZone) ? timeZone : 'UTC'));
  return z;
}

/** date-fns's option for reading and formatting in a zone (@date-fns/tz). */
const inZone = (timeZone: string) => ({ in: tz(safeZone(timeZone)) });

function parts(value: string | Date, timeZone: string) {
  const day = typeof value === 'string' && DAY_ONLY.test(value);
  const d = day ? new Date(`${value}T12:00:00Z`) : typeof value === 'string' ? new Date(value) : value;
  const at = inZone(day ? 'UTC' : timeZone);
  return { date: format(d, 'MMM d, yyyy', at), time: format(d, 'HH:mm', at), monthDay: format(d, 'MMM d', at) };
}

/** "Dec 3, 2026, 17:30" in the zone; `{ time: false }` gives "Dec 3, 2026". */
export function formatWhen(value: string | Date, timeZone: string, opts: { time?: boolean } = {}): string {
  const p = parts(value, timeZone);
  return opts.time === false ? p.date : `${p.date}, ${p.time}`;
}

/** "Dec 3, 2026" in the zone (a bare calendar date as itself). */
export function formatDate(value: string | Date, timeZone: string): string {
  return parts(value, timeZone).date;
}

/** "17:30" in the zone. */
export function formatTime(value: string | Date, timeZone: string): string {
  return parts(value, timeZone).time;
}

/** "Dec 3" in the zone, for short lists where the year is plain. */
export function formatMonthDay(value: string | Date, timeZone: string): string {
  return parts(value, timeZone).monthDay;
}

/** A month 'YYYY-MM' in the one style: "Feb 2026" (the month itself, in every zone). */
export function formatMonth(period: string): string {
  const [y, m] = period.split('-').map(Number) as [number, number];
  return format(new Date(Date.UTC(y, m - 1, 15, 12)), 'MMM yyyy', inZone('UTC'));
}

/** A moment as its calendar day YYYY-MM-DD in a time zone (date inputs, due dates, periods). */
export function isoDay(d: Date, timeZone: string): string {
  return format(d, 'yyyy-MM-dd', inZone(timeZone));
}

/** Today's date YYYY-MM-DD in a time zone. */
export function todayIn(timeZone: string, now = new Date()): string {
  return isoDay(now, timeZone);
}

/**
 * The instant of a wall-clock time in a time zone (daylight-saving shifts included), e.g. the
 * start of a reservation day at 00:00 in the co-op's zone. `month` is 1–12.
 */
export function zonedToUtc(
  year: number,
  month: number,
  day: number,
  hour: number,
  minute: number,
  timeZone: string,
): Date {
  return new Date(new TZDate(year, month - 1, day, hour, minute, safeZone(timeZone)).getTime());
}
