/**
 * Dates for the tank screens, in the co-op's time zone, in one fixed shape ("Dec 3, 2026, 17:30")
 * built from parts so server and browser render the same text (pure; safe in client code).
 */
const formats = new Map<string, Intl.DateTimeFormat>();
function whenFormat(timeZone: string): Intl.DateTimeFormat {
  let f = formats.get(timeZone);
  if (!f) formats.set(timeZone, (f = new Intl.DateTimeFormat('en-US', { timeZone, year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })));
  return f;
}

export function formatWhen(iso: string | Date, timeZone: string, opts: { time?: boolean } = {}): string {
  const d = typeof iso === 'string' ? new Date(iso) : iso;
  const parts = whenFormat(timeZone).formatToParts(d);
  const p = (t: string) => parts.find((x) => x.type === t)?.value ?? '';
  const date = `${p('month')} ${p('day')}, ${p('year')}`;
  return opts.time === false ? date : `${date}, ${p('hour')}:${p('minute')}`;
}

/** A date as YYYY-MM-DD in a time zone (for date inputs). */
export function isoDay(d: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(d);
  const p = (t: string) => parts.find((x) => x.type === t)?.value;
  return `${p('year')}-${p('month')}-${p('day')}`;
}
