import { describe, expect, it } from 'vitest';
import { formatDate, formatMonth, formatMonthDay, formatTime, formatWhen, isoDay } from '@/lib/dates';
import { dateText } from '@/components/brewing/format';
import { xText } from '@/components/charts/x-text';

// One instant near midnight: 2026-03-01 20:30 UTC is already Mar 2 in Tokyo (UTC+9, no DST;
// IANA tz database) and still Mar 1 in Chicago (UTC−6 before the US change on Mar 8, 2026).
const AT = '2026-03-01T20:30:00Z';

describe('lib/dates: one style, in the co-op’s zone', () => {
  it('shows a moment in the given zone, whatever the machine’s zone', () => {
    expect(formatWhen(AT, 'Asia/Tokyo')).toBe('Mar 2, 2026, 05:30');
    expect(formatWhen(AT, 'America/Chicago')).toBe('Mar 1, 2026, 14:30');
    expect(formatWhen(AT, 'UTC')).toBe('Mar 1, 2026, 20:30');
    expect(formatWhen(new Date(AT), 'Asia/Tokyo', { time: false })).toBe('Mar 2, 2026');
    expect(formatTime(AT, 'Asia/Tokyo')).toBe('05:30');
    expect(formatMonthDay(AT, 'Asia/Tokyo')).toBe('Mar 2');
    expect(isoDay(new Date(AT), 'Asia/Tokyo')).toBe('2026-03-02');
  });

  it('uses the 24-hour clock at midnight (00:05, never 24:05 or 12:05 AM)', () => {
    expect(formatWhen('2026-06-30T15:05:00Z', 'Asia/Tokyo')).toBe('Jul 1, 2026, 00:05');
  });

  it('keeps a bare calendar date as that day in every zone', () => {
    for (const tz of ['Pacific/Kiritimati', 'Pacific/Pago_Pago', 'UTC'])
      expect(formatDate('2026-12-06', tz)).toBe('Dec 6, 2026');
  });

  it('is the style of the brewing pages too (a missing date shows as a dash)', () => {
    expect(formatDate(new Date(AT), 'Asia/Tokyo')).toBe('Mar 2, 2026');
    expect(dateText(AT, 'Asia/Tokyo')).toBe('Mar 2, 2026');
    expect(dateText('2026-12-06')).toBe('Dec 6, 2026');
    expect(dateText(null)).toBe('—');
  });

  it('falls back to UTC for a zone name the runtime does not know', () => {
    expect(formatWhen(AT, 'Mars/Olympus_Mons')).toBe('Mar 1, 2026, 20:30');
  });

  it('shows a month as "Feb 2026" (chart axes), never as ISO', () => {
    expect(formatMonth('2026-02')).toBe('Feb 2026');
    expect(formatMonth('2026-12')).toBe('Dec 2026');
    expect(xText('2026-02')).toBe('Feb 2026');
    expect(xText('2026-02-05')).toBe('Feb 5, 2026');
    expect(xText('Batch 7')).toBe('Batch 7');
  });
});
