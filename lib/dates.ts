/**
 * The one way to show dates and times: always in the co-op's time zone, always in one shape —
 * "Dec 3, 2026" for a day, "Dec 3, 2026, 17:30" for a moment, "17:30" for a time of day (24-hour
 * clock). Built from Intl parts, so the server and the browser render the same text whatever
 * their own zone (pure; safe in client components and e-mails).
 *
 * A bare calendar date ("2026-12-03": a batch date, a due date) is a day, not a moment, and is
 * shown as that day in every zone.
 */
const DAY_ONLY = /^\d{4}-\d{2}-\d{2}$/;

const formats = new Map<string, Intl.DateTimeFormat>();
function partsFormat(timeZone: string): Intl.DateTimeFormat {
  let f = formats.get(timeZone);
  if (!f) {
    try {
      f = new Intl.DateTimeFormat('en-US', { timeZone, year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    } catch {
      // An unknown zone name in a co-op's settings must not stop a page or an e-mail.
      f = partsFormat('UTC');
    }
    formats.set(timeZone, f);
  }
  return f;
}

function parts(value: string | Date, timeZone: string) {
  const day = typeof value === 'string' && DAY_ONLY.test(value);
  const d = day ? new Date(`${value}T12:00:00Z`) : typeof value === 'string' ? new Date(value) : value;
  const ps = partsFormat(day ? 'UTC' : timeZone).formatToParts(d);
  const p = (t: string) => ps.find((x) => x.type === t)?.value ?? '';
  return { date: `${p('month')} ${p('day')}, ${p('year')}`, time: `${p('hour')}:${p('minute')}`, monthDay: `${p('month')} ${p('day')}` };
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
  const p = parts(new Date(Date.UTC(y, m - 1, 15, 12)), 'UTC');
  return `${p.monthDay.split(' ')[0]} ${y}`;
}

/** A moment as YYYY-MM-DD in a time zone (for date inputs). */
export function isoDay(d: Date, timeZone: string): string {
  const ps = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(d);
  const p = (t: string) => ps.find((x) => x.type === t)?.value;
  return `${p('year')}-${p('month')}-${p('day')}`;
}
