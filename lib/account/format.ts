// Date wording for account screens and e-mails (pure; safe in client components too).
import { formatWhen } from '@/lib/dates';

/** The zone itself when the runtime knows it, else UTC (what lib/dates falls back to). */
function knownZone(timeZone: string): string {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone });
    return timeZone;
  } catch {
    // An unknown zone name in a co-op's settings must not stop a page or an e-mail.
    return 'UTC';
  }
}

/**
 * "Dec 8, 2026, 14:05 (America/Chicago)": when an e-mailed link stops working, in the one style
 * (lib/dates) and the co-op's time zone, named so nobody has to guess whose clock it is.
 */
export function formatExpiry(at: Date, timeZone = 'UTC'): string {
  const zone = knownZone(timeZone);
  return `${formatWhen(at, zone)} (${zone})`;
}
