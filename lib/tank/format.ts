/**
 * Dates for the tank screens, in the co-op's time zone, in one fixed shape ("Dec 3, 2026, 17:30")
 * built from parts so server and browser render the same text (pure; safe in client code).
 */
export function formatWhen(iso: string | Date, timeZone: string, opts: { time?: boolean } = {}): string {
  const d = typeof iso === 'string' ? new Date(iso) : iso;
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone, year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
  }).formatToParts(d);
  const p = (t: string) => parts.find((x) => x.type === t)?.value ?? '';
  const date = `${p('month')} ${p('day')}, ${p('year')}`;
  return opts.time === false ? date : `${date}, ${p('hour')}:${p('minute')}`;
}

/** A date as YYYY-MM-DD in a time zone (for date inputs). */
export function isoDay(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(d);
}
