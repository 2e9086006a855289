// E-mails speak the co-op's zone in the one date style (lib/dates): a password reset for a member
// of a Tokyo co-op says when its link expires in Tokyo time, naming the zone.
import { describe, expect, it } from 'vitest';
import { formatExpiry } from '@/lib/account/format';
import { api, makeCoop, makeUser, sql, waitForMail } from '../support/api';

describe('dates in e-mails', () => {
  it('writes a password reset link’s expiry in the co-op’s zone', async () => {
    const coop = await makeCoop();
    await sql(`UPDATE coops SET timezone = 'Asia/Tokyo' WHERE id = $1`, [coop.id]);
    const u = await makeUser({ coopId: coop.id, role: 'member' });
    await api().post('/api/password-reset').send({ email: u.email }).expect(202);
    const mail = await waitForMail(u.email);
    const [row] = await sql<{ expires_at: Date }>(
      `SELECT expires_at FROM auth_tokens WHERE user_id = $1 AND kind = 'password-reset'`,
      [u.id],
    );
    expect(mail.text).toContain(`expires on ${formatExpiry(new Date(row!.expires_at), 'Asia/Tokyo')}.`);
    expect(mail.text).toMatch(/expires on [A-Z][a-z]{2} \d{1,2}, \d{4}, \d{2}:\d{2} \(Asia\/Tokyo\)\./);
  });
});
