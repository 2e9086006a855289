// Date wording for account screens and e-mails (pure; safe in client components too).
import { formatDate } from '@/lib/dates';

function inZone(at: Date, options: Intl.DateTimeFormatOptions, timeZone: string): { text: string; timeZone: string } {
  try {
    return { text: new Intl.DateTimeFormat('en-GB', { ...options, timeZone }).format(at), timeZone };
  } catch {
    // An unknown zone name in a co-op's settings must not stop a page or an e-mail.
    return { text: new Intl.DateTimeFormat('en-GB', { ...options, timeZone: 'UTC' }).format(at), timeZone: 'UTC' };
  }
}

/**
 * "Tuesday, 8 December 2026 at 14:05 (America/Chicago)": when an e-mailed link stops working,
 * in the co-op's time zone (UTC for person-level e-mails that belong to no co-op).
 */
export function formatExpiry(at: Date, timeZone = 'UTC'): string {
  const r = inZone(at, { dateStyle: 'full', timeStyle: 'short' }, timeZone);
  return `${r.text} (${r.timeZone})`;
}

/** "Dec 8, 2026" in the given time zone (tables; the one style, lib/dates). */
export function formatDay(at: Date | string, timeZone = 'UTC'): string {
  return formatDate(at, timeZone);
}
