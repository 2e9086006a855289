import { formatWhen } from '@/lib/dates';

/**
 * A moment or a day in the co-op's zone and the one style (lib/dates), as a <time> element
 * carrying the exact instant, so the page's dates can be checked and read by machines.
 */
export function When({
  value,
  timeZone,
  time = true,
  className,
}: {
  value: string | Date;
  timeZone: string;
  time?: boolean;
  className?: string;
}) {
  const iso = typeof value === 'string' ? value : value.toISOString();
  return (
    <time dateTime={iso} className={className}>
      {formatWhen(iso, timeZone, { time })}
    </time>
  );
}
