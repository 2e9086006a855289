// Sign-in throttling cannot lock the owner out: anonymous wrong passwords make strangers wait,
// while a device that signed in to the account before keeps being let in.
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { baseUrl, makeUser, signIn, sql, TEST_PASSWORD } from '../support/api';

async function attempt(agent: ReturnType<typeof request.agent>, email: string, password: string) {
  const csrf = await agent.get('/api/auth/csrf').expect(200);
  const res = await agent
    .post('/api/auth/callback/credentials')
    .type('form')
    .send({ csrfToken: csrf.body.csrfToken, email, password, json: 'true' });
  return { res, ok: res.status === 200 && !String(res.body?.url ?? '').includes('error=') };
}

describe('sign-in throttling', () => {
  afterAll(async () => {
    await sql('DELETE FROM sign_in_attempts WHERE NOT succeeded');
  });

  it('ten anonymous wrong passwords do not stop the owner on a known device', async () => {
    const u = await makeUser();
    const laptop = await signIn(u.email); // a successful sign-in marks the laptop as known

    for (let i = 1; i <= 10; i++) {
      const { ok } = await attempt(request.agent(baseUrl()), u.email, `attacker-guess-${i}-xx`);
      expect(ok).toBe(false);
    }
    // A stranger now waits, even with the right password…
    const stranger = await attempt(request.agent(baseUrl()), u.email, TEST_PASSWORD);
    expect(stranger.res.status).toBe(429);
    expect(Number(stranger.res.headers['retry-after'])).toBeGreaterThan(0);
    // …but the owner's laptop signs in.
    const owner = await attempt(laptop, u.email, TEST_PASSWORD);
    expect(owner.ok).toBe(true);
    await laptop.get('/api/me').expect(200);
  });

  it('the wait doubles with each failure past the tenth', async () => {
    const u = await makeUser();
    await sql(
      `INSERT INTO sign_in_attempts (email, address, succeeded, created_at)
       SELECT $1, 'unknown', false, now() - interval '20 minutes' FROM generate_series(1, 10)`,
      [u.email],
    );
    // The 15-minute wait after the tenth failure is over: one more try is checked (and fails)…
    expect((await attempt(request.agent(baseUrl()), u.email, 'still-not-it-xx')).ok).toBe(false);
    // …and the next wait is 30 minutes.
    const { res } = await attempt(request.agent(baseUrl()), u.email, TEST_PASSWORD);
    expect(res.status).toBe(429);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(25 * 60);
    expect(Number(res.headers['retry-after'])).toBeLessThanOrEqual(30 * 60);
  });

  it("a forged or other account's known-device cookie does not help", async () => {
    const victim = await makeUser();
    const attacker = await makeUser();
    const agent = await signIn(attacker.email); // known device of the attacker's own account
    for (let i = 1; i <= 10; i++) await attempt(request.agent(baseUrl()), victim.email, `guess-${i}-xxxxxx`);
    expect((await attempt(agent, victim.email, TEST_PASSWORD)).res.status).toBe(429);
    const forged = request.agent(baseUrl());
    forged.jar.setCookie('tallyvat-device=AAAAAAAAAAAAAAAAAAAAAA.9999999999.forged; Path=/api/auth');
    expect((await attempt(forged, victim.email, TEST_PASSWORD)).res.status).toBe(429);
  });
});
