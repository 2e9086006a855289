// No account enumeration through the e-mail change, and no unlimited current-password guessing
// inside a session.
import { describe, expect, it } from 'vitest';
import { countRows, makeUser, signIn, TEST_PASSWORD, waitForMail } from '../support/api';

describe('e-mail change and current-password checks', () => {
  it("answers 202 for an address another account uses, and that account's owner gets an e-mail", async () => {
    const u = await makeUser();
    const taken = await makeUser();
    const agent = await signIn(u.email);
    const free = `free-${Date.now().toString(36)}@example.org`;
    const a = await agent
      .post('/api/me/email')
      .send({ email: taken.email, currentPassword: TEST_PASSWORD })
      .expect(202);
    const b = await agent.post('/api/me/email').send({ email: free, currentPassword: TEST_PASSWORD }).expect(202);
    expect(Object.keys(a.body)).toEqual(Object.keys(b.body));
    const notice = await waitForMail(taken.email);
    expect(notice.subject).toMatch(/tried to use your e-mail address/);
    expect(await countRows('auth_tokens', 'user_id = $1 AND new_email = $2', [u.id, taken.email])).toBe(0);
  });

  it('current-password guessing inside a session gets 429 after five wrong', async () => {
    const u = await makeUser();
    const agent = await signIn(u.email);
    for (let i = 1; i <= 5; i++) {
      await agent
        .post('/api/me/password')
        .send({ currentPassword: `guess-${i}-xxxxxxx`, newPassword: 'quarry-violet-tandem-82' })
        .expect(422);
    }
    await agent
      .post('/api/me/password')
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'quarry-violet-tandem-82' })
      .expect(429);
    await agent.post('/api/me/email').send({ email: 'x-new@example.org', currentPassword: TEST_PASSWORD }).expect(429);
    await agent.get('/api/me').expect(200);
  });
});
