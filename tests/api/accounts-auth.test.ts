// Sign-in rate limit, password reset by e-mail, the profile (name, password, e-mail address)
// and "sign out everywhere".
import crypto from 'node:crypto';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { api, baseUrl, countRows, makeCoop, makeUser, signIn, sql, TEST_PASSWORD, waitForMail } from '../support/api';

const NEW_PASSWORD = 'quarry-violet-tandem-82';
const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

/** One sign-in attempt through next-auth's credentials endpoint, as the sign-in form makes it. */
async function attempt(email: string, password: string) {
  const agent = request.agent(baseUrl());
  const csrf = await agent.get('/api/auth/csrf').expect(200);
  const res = await agent
    .post('/api/auth/callback/credentials')
    .type('form')
    .send({ csrfToken: csrf.body.csrfToken, email, password, json: 'true' });
  return { res, failed: res.status !== 200 || String(res.body?.url ?? '').includes('error=') };
}

function tokenIn(text: string, path: string): string {
  const m = text.match(new RegExp(`https?://\\S+/${path}/([A-Za-z0-9_-]{43})`));
  if (!m) throw new Error(`no /${path}/ link in:\n${text}`);
  return m[1]!;
}

describe('sign-in rate limit', () => {
  // All tests share one address; clear what this file leaves so later sign-ins are not blocked.
  afterAll(async () => {
    await sql('DELETE FROM sign_in_attempts WHERE NOT succeeded');
  });

  it('refuses the 11th attempt for one account within 15 minutes with 429, even with the right password; a reset lifts it', async () => {
    await sql('DELETE FROM sign_in_attempts WHERE NOT succeeded');
    const coop = await makeCoop();
    const u = await makeUser({ coopId: coop.id });
    for (let i = 1; i <= 10; i++) {
      const { res, failed } = await attempt(u.email, `wrong-password-${i}-xx`);
      expect(res.status, `attempt ${i}`).not.toBe(429);
      expect(failed).toBe(true);
    }
    const { res } = await attempt(u.email, TEST_PASSWORD);
    expect(res.status).toBe(429);
    expect(res.body.error).toMatch(/Too many failed sign-ins/);
    // The wait counts down from 15 minutes (it doubles with every further failure after it).
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(800);
    expect(Number(res.headers['retry-after'])).toBeLessThanOrEqual(900);
    expect(await countRows('sign_in_attempts', 'email = $1 AND NOT succeeded', [u.email])).toBe(10);

    // Per account: somebody else signs in fine meanwhile.
    const other = await makeUser({ coopId: coop.id });
    await signIn(other.email);

    // The 429 message suggests a reset: it does lift the account's lock.
    await api().post('/api/password-reset').send({ email: u.email }).expect(202);
    const token = tokenIn((await waitForMail(u.email)).text, 'reset-password');
    await api().post(`/api/password-reset/${token}`).send({ password: NEW_PASSWORD }).expect(200);
    await signIn(u.email, NEW_PASSWORD);
  });
});

describe('password reset', () => {
  it('answers the same whether or not the address has an account, and e-mails a single-use link', async () => {
    const u = await makeUser();
    const agent = await signIn(u.email);
    const known = await api().post('/api/password-reset').send({ email: u.email.toUpperCase() }).expect(202);
    const unknownEmail = `nobody-${Date.now()}@example.org`;
    const unknown = await api().post('/api/password-reset').send({ email: unknownEmail }).expect(202);
    expect(unknown.body).toEqual(known.body);
    expect(known.body.message).toMatch(/If an account uses that address/);

    const mail = await waitForMail(u.email);
    expect(mail.subject).toBe('Reset your Tallyvat password');
    const token = tokenIn(mail.text, 'reset-password');
    expect(mail.text).toContain(`${baseUrl()}/reset-password/${token}`);
    const [row] = await sql<{ token_hash: string; expires_at: Date }>(
      `SELECT token_hash, expires_at FROM auth_tokens WHERE user_id = $1 AND kind = 'password-reset'`,
      [u.id],
    );
    expect(row!.token_hash).toBe(sha256(token));
    expect(Math.abs(new Date(row!.expires_at).getTime() - (Date.now() + 3_600_000))).toBeLessThan(60_000);

    expect((await api().get(`/reset-password/${token}`).expect(200)).text).toContain('Choose a new password');
    expect((await api().get(`/api/password-reset/${token}`).expect(200)).body).toEqual({ email: u.email });

    // Bad passwords are refused and change nothing.
    const [before] = await sql<{ password_hash: string; session_version: number }>(
      'SELECT password_hash, session_version FROM users WHERE id = $1',
      [u.id],
    );
    for (const [body, reason] of [
      [{ password: 'short' }, /at least 12/],
      [{ password: 'passwordpassword' }, /commonly used/],
      [{ password: 'y'.repeat(129) }, /at most 128/],
      [{}, /password/i],
    ] as const) {
      const res = await api().post(`/api/password-reset/${token}`).send(body).expect(422);
      expect(res.body.fields.password.join(' ')).toMatch(reason);
    }
    const smuggled = await api()
      .post(`/api/password-reset/${token}`)
      .send({ password: NEW_PASSWORD, email: 'other@example.org' })
      .expect(422);
    expect(Object.keys(smuggled.body.fields)).toEqual(['email']);
    const [unchanged] = await sql('SELECT password_hash, session_version FROM users WHERE id = $1', [u.id]);
    expect(unchanged).toEqual(before);

    // The reset sets the password and ends every session.
    await api().post(`/api/password-reset/${token}`).send({ password: NEW_PASSWORD }).expect(200);
    await agent.get('/api/me').expect(401);
    expect((await attempt(u.email, TEST_PASSWORD)).failed).toBe(true);
    await signIn(u.email, NEW_PASSWORD);

    // Single use.
    const reused = await api()
      .post(`/api/password-reset/${token}`)
      .send({ password: 'another-good-passphrase' })
      .expect(410);
    expect(reused.body).toMatchObject({ reason: 'used', error: expect.stringMatching(/already been used/) });
    expect((await api().get(`/reset-password/${token}`).expect(200)).text).toContain('already been used');
    await sql('DELETE FROM sign_in_attempts WHERE NOT succeeded');

    // Nothing was created for the unknown address.
    expect(
      await countRows('auth_tokens t JOIN users u ON u.id = t.user_id', 'lower(u.email) = $1', [unknownEmail]),
    ).toBe(0);
  });

  it('a link older than one hour is refused', async () => {
    const u = await makeUser();
    await api().post('/api/password-reset').send({ email: u.email }).expect(202);
    const token = tokenIn((await waitForMail(u.email)).text, 'reset-password');
    await sql(`UPDATE auth_tokens SET expires_at = now() - interval '1 second' WHERE token_hash = $1`, [sha256(token)]);
    expect((await api().get(`/api/password-reset/${token}`).expect(410)).body.reason).toBe('expired');
    const res = await api().post(`/api/password-reset/${token}`).send({ password: NEW_PASSWORD }).expect(410);
    expect(res.body.error).toMatch(/expired/);
    expect((await attempt(u.email, TEST_PASSWORD)).failed).toBe(false);
  });

  it('unknown links are 404; malformed requests are 422; at most three links an hour per account', async () => {
    await api()
      .get(`/api/password-reset/${crypto.randomBytes(32).toString('base64url')}`)
      .expect(404);
    await api().post('/api/password-reset/nope').send({ password: NEW_PASSWORD }).expect(404);
    expect((await api().post('/api/password-reset').send({}).expect(422)).body.fields.email).toBeDefined();
    expect((await api().post('/api/password-reset').send({ email: 'x' }).expect(422)).body.fields.email).toBeDefined();
    const u = await makeUser();
    for (let i = 0; i < 4; i++) await api().post('/api/password-reset').send({ email: u.email }).expect(202);
    expect(await countRows('auth_tokens', "user_id = $1 AND kind = 'password-reset'", [u.id])).toBe(3);
  });
});

describe('profile: /api/me', () => {
  it('shows my name, e-mail and co-ops with role', async () => {
    const a = await makeCoop({ name: 'Alder Street Fuel' });
    const b = await makeCoop({ name: 'Birchwood Oil Guild' });
    const u = await makeUser({ coopId: a.id, role: 'treasurer', name: 'Wilhelmina Sato' });
    await sql(`INSERT INTO memberships (coop_id, user_id, role, status) VALUES ($1, $2, 'member', 'suspended')`, [
      b.id,
      u.id,
    ]);
    const agent = await signIn(u.email);
    const res = await agent.get('/api/me').expect(200);
    expect(res.body).toMatchObject({ id: u.id, name: 'Wilhelmina Sato', email: u.email, pendingEmail: null });
    expect(res.body.coops).toEqual([
      expect.objectContaining({ slug: a.slug, role: 'treasurer', status: 'active' }),
      expect.objectContaining({ slug: b.slug, role: 'member', status: 'suspended' }),
    ]);
    expect(JSON.stringify(res.body)).not.toMatch(/password|session/i);
    const page = await agent.get('/profile').expect(200);
    expect(page.text).toContain('Alder Street Fuel');
  });

  it('renames, audited in each of my co-ops; bad input is 422 and changes nothing', async () => {
    const coop = await makeCoop();
    const u = await makeUser({ coopId: coop.id, name: 'Old Name' });
    const agent = await signIn(u.email);
    for (const [body, field] of [
      [{}, 'name'],
      [{ name: '   ' }, 'name'],
      [{ name: 'n'.repeat(121) }, 'name'],
      [{ name: 5 }, 'name'],
      [{ name: 'Bad\u0000Name' }, 'name'],
      [{ name: 'Fine Name', email: 'someone@example.org' }, 'email'],
      [{ name: 'Fine Name', role: 'admin' }, 'role'],
    ] as const) {
      const res = await agent.patch('/api/me').send(body).expect(422);
      expect(Object.keys(res.body.fields), JSON.stringify(body)).toEqual([field]);
    }
    expect((await sql('SELECT name FROM users WHERE id = $1', [u.id]))[0]).toEqual({ name: 'Old Name' });
    await agent.patch('/api/me').send({ name: '  Ottoline Brack  ' }).expect(200);
    expect((await sql('SELECT name FROM users WHERE id = $1', [u.id]))[0]).toEqual({ name: 'Ottoline Brack' });
    const [event] = await sql(
      `SELECT action, before, after FROM audit_events WHERE coop_id = $1 AND entity_type = 'user'`,
      [coop.id],
    );
    expect(event).toEqual({ action: 'user.rename', before: { name: 'Old Name' }, after: { name: 'Ottoline Brack' } });
  });

  it('changes the password only with the current one; every session ends', async () => {
    const u = await makeUser();
    const laptop = await signIn(u.email);
    const phone = await signIn(u.email);
    const [before] = await sql('SELECT password_hash, session_version FROM users WHERE id = $1', [u.id]);
    const cases: [object, string, RegExp][] = [
      [
        { currentPassword: 'not-my-password-at-all', newPassword: NEW_PASSWORD },
        'currentPassword',
        /not your current password/,
      ],
      [{ currentPassword: TEST_PASSWORD, newPassword: 'QwertyQwerty' }, 'newPassword', /commonly used/],
      [{ currentPassword: TEST_PASSWORD, newPassword: 'short' }, 'newPassword', /at least 12/],
      [{ currentPassword: TEST_PASSWORD, newPassword: TEST_PASSWORD }, 'newPassword', /different/],
      [{ newPassword: NEW_PASSWORD }, 'currentPassword', /current password/],
      [{ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD, userId: 1 }, 'userId', /not accepted/],
    ];
    for (const [body, field, reason] of cases) {
      const res = await laptop.post('/api/me/password').send(body).expect(422);
      expect(Object.keys(res.body.fields), JSON.stringify(body)).toEqual([field]);
      expect(res.body.fields[field].join(' ')).toMatch(reason);
    }
    expect((await sql('SELECT password_hash, session_version FROM users WHERE id = $1', [u.id]))[0]).toEqual(before);

    await laptop
      .post('/api/me/password')
      .send({ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD })
      .expect(200);
    await phone.get('/api/me').expect(401);
    await laptop.get('/api/me').expect(401); // the form signs this browser back in with the new password
    await signIn(u.email, NEW_PASSWORD);
    expect((await attempt(u.email, TEST_PASSWORD)).failed).toBe(true);
    await sql('DELETE FROM sign_in_attempts WHERE NOT succeeded');
  });

  it('changes the e-mail address only after the link sent to the new address is opened', async () => {
    const coop = await makeCoop();
    const u = await makeUser({ coopId: coop.id });
    const taken = await makeUser();
    const agent = await signIn(u.email);
    const newEmail = `moved-${Date.now().toString(36)}@example.org`;

    expect(
      (await agent.post('/api/me/email').send({ email: newEmail, currentPassword: 'wrong-password-here' }).expect(422))
        .body.fields,
    ).toHaveProperty('currentPassword');
    // A taken address gets the same answer (nothing reveals who has an account); its owner is told.
    expect(
      (await agent.post('/api/me/email').send({ email: taken.email, currentPassword: TEST_PASSWORD }).expect(202)).body,
    ).toEqual({ pendingEmail: taken.email, sent: true });
    expect((await waitForMail(taken.email)).subject).toMatch(/tried to use your e-mail address/);
    expect(
      (await agent.post('/api/me/email').send({ email: u.email, currentPassword: TEST_PASSWORD }).expect(422)).body
        .fields,
    ).toHaveProperty('email');
    expect(
      (await agent.post('/api/me/email').send({ email: 'nope', currentPassword: TEST_PASSWORD }).expect(422)).body
        .fields,
    ).toHaveProperty('email');
    expect(await countRows('auth_tokens', 'user_id = $1', [u.id])).toBe(0);

    const res = await agent
      .post('/api/me/email')
      .send({ email: newEmail.toUpperCase(), currentPassword: TEST_PASSWORD })
      .expect(202);
    expect(res.body).toEqual({ pendingEmail: newEmail, sent: true });
    expect((await agent.get('/api/me').expect(200)).body).toMatchObject({ email: u.email, pendingEmail: newEmail });
    const confirmation = await waitForMail(newEmail);
    const token = tokenIn(confirmation.text, 'confirm-email');
    // The profile follows the confirmation e-mail from the send ledger: sent, under the caught Message-ID.
    let me = (await agent.get('/api/me').expect(200)).body;
    for (let i = 0; i < 50 && me.pendingEmailDelivery?.status !== 'sent'; i++) {
      await new Promise((r) => setTimeout(r, 100));
      me = (await agent.get('/api/me').expect(200)).body;
    }
    expect(me.pendingEmailDelivery).toEqual({ status: 'sent', sentAt: expect.any(String) });
    expect((await agent.get('/profile').expect(200)).text).toContain('Confirmation e-mail: sent.');
    const [link] = await sql<{ id: number }>(
      `SELECT id FROM auth_tokens WHERE user_id = $1 AND kind = 'email-change' AND used_at IS NULL`,
      [u.id],
    );
    expect(
      await sql('SELECT message_id, state FROM mail_sends WHERE subject = $1', [`email-change.${link!.id}`]),
    ).toEqual([{ message_id: confirmation.messageId, state: 'sent' }]);

    const page = await api().get(`/confirm-email/${token}`).expect(200);
    expect(page.text).toContain(newEmail);
    // Opening the page does not use the link up (mail scanners fetch links); the button does.
    expect((await sql('SELECT email FROM users WHERE id = $1', [u.id]))[0]).toEqual({ email: u.email });
    await api().post('/api/me/email/confirm').send({ token }).expect(200);
    expect((await sql('SELECT email FROM users WHERE id = $1', [u.id]))[0]).toEqual({ email: newEmail });
    const notice = await waitForMail(u.email, (m) => m.subject === 'Your Tallyvat e-mail address was changed');
    expect(notice.text).toContain(newEmail);
    const [event] = await sql(
      `SELECT before, after FROM audit_events WHERE coop_id = $1 AND action = 'user.email-change'`,
      [coop.id],
    );
    expect(event).toEqual({ before: { email: u.email }, after: { email: newEmail } });

    expect((await agent.get('/api/me').expect(200)).body.email).toBe(newEmail);
    await signIn(newEmail);
    const reused = await api().post('/api/me/email/confirm').send({ token }).expect(410);
    expect(reused.body.reason).toBe('used');
    await api().post('/api/me/email/confirm').send({ token: 'garbage' }).expect(404);
    expect((await api().post('/api/me/email/confirm').send({ token: 5 }).expect(422)).body.fields).toHaveProperty(
      'token',
    );
  });

  it('a pending change whose confirmation e-mail has neither a ledger row nor a live job shows "failed" (ask again)', async () => {
    const u = await makeUser();
    const agent = await signIn(u.email);
    // What every try failing leaves behind once its job is gone: the link, and no sent message.
    await sql(
      `INSERT INTO auth_tokens (user_id, kind, token_hash, new_email, expires_at) VALUES ($1, 'email-change', $2, $3, now() + interval '1 day')`,
      [u.id, crypto.randomBytes(32).toString('hex'), `lost-${Date.now().toString(36)}@example.org`],
    );
    expect((await agent.get('/api/me').expect(200)).body.pendingEmailDelivery).toEqual({
      status: 'failed',
      sentAt: null,
    });
    expect((await agent.get('/profile').expect(200)).text).toContain('Confirmation e-mail not delivered');
  });

  it('"sign out everywhere" ends every session of mine on the next request', async () => {
    const u = await makeUser();
    const one = await signIn(u.email);
    const two = await signIn(u.email);
    await two.get('/api/me').expect(200);
    await one.post('/api/me/sign-out-everywhere').expect(200);
    await one.get('/api/me').expect(401);
    await two.get('/api/me').expect(401);
    await signIn(u.email);
  });
});
