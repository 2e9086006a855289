// Sign-out revokes the session on the server: a cookie copied before "Sign out" stops working.
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { baseUrl, makeCoop, makeUser, signIn, sql } from '../support/api';

describe('sign-out', () => {
  it('a session cookie copied before sign-out gets 401 after it', async () => {
    const coop = await makeCoop();
    const u = await makeUser({ coopId: coop.id });
    const browser = await signIn(u.email);
    const me = await browser.get('/api/me').expect(200);
    // The attacker copies the Cookie header the browser sends.
    const copied = String((me as unknown as { req: { getHeader(name: string): unknown } }).req.getHeader('cookie'));
    expect(copied).toMatch(/session-token=/);
    await request(baseUrl()).get('/api/me').set('Cookie', copied).expect(200);
    await request(baseUrl())
      .get(`/api/coops/${coop.slug}/tanks`)
      .set('Cookie', copied)
      .expect((r) => expect(r.status).not.toBe(401));

    const csrf = await browser.get('/api/auth/csrf').expect(200);
    await browser
      .post('/api/auth/signout')
      .type('form')
      .send({ csrfToken: csrf.body.csrfToken, json: 'true' })
      .expect(200);

    await request(baseUrl()).get('/api/me').set('Cookie', copied).expect(401);
    await request(baseUrl()).get(`/api/coops/${coop.slug}/tanks`).set('Cookie', copied).expect(401);
    const rows = await sql<{ revoked: boolean }>(
      'SELECT revoked_at IS NOT NULL AS revoked FROM sessions WHERE user_id = $1',
      [u.id],
    );
    expect(rows).toEqual([{ revoked: true }]);
  });

  it('a session past its absolute lifetime or idle for a week is signed out', async () => {
    const u = await makeUser();
    const agent = await signIn(u.email);
    await agent.get('/api/me').expect(200);
    await sql(`UPDATE sessions SET last_seen_at = now() - interval '8 days' WHERE user_id = $1`, [u.id]);
    await agent.get('/api/me').expect(401);

    const again = await signIn(u.email);
    await again.get('/api/me').expect(200);
    await sql(
      `UPDATE sessions SET expires_at = now() - interval '1 second' WHERE user_id = $1 AND revoked_at IS NULL`,
      [u.id],
    );
    await again.get('/api/me').expect(401);
  });
});
