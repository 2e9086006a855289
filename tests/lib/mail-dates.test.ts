import { describe, expect, it } from 'vitest';
import { formatExpiry } from '@/lib/account/format';
import { invitationMail } from '@/lib/members/invitations/deliver';

// 2026-03-01 20:30 UTC is already Mar 2, 05:30 in Tokyo (UTC+9, no DST; IANA tz database).
const AT = new Date('2026-03-01T20:30:00Z');

describe('e-mails: dates in the co-op’s zone and the one style (lib/dates)', () => {
  it('says when a link expires in the zone, naming it', () => {
    expect(formatExpiry(AT, 'Asia/Tokyo')).toBe('Mar 2, 2026, 05:30 (Asia/Tokyo)');
    expect(formatExpiry(AT)).toBe('Mar 1, 2026, 20:30 (UTC)');
    // An unknown zone name in a co-op's settings falls back to UTC and says so.
    expect(formatExpiry(AT, 'Mars/Olympus_Mons')).toBe('Mar 1, 2026, 20:30 (UTC)');
  });

  it('writes the invitation’s expiry in the co-op’s zone', () => {
    const mail = invitationMail({
      coopName: 'Test Co-op',
      inviter: 'An Admin',
      role: 'member',
      token: 't0ken',
      expiresAt: AT,
      timezone: 'Asia/Tokyo',
    });
    expect(mail.text).toContain('expires on Mar 2, 2026, 05:30 (Asia/Tokyo).');
    expect(mail.text).not.toMatch(/\d{4}-\d{2}-\d{2}|GMT|UTC/);
  });
});
