// The operator's way in (`npm run user:create`): an account and a one-hour link to choose its
// password, printed rather than e-mailed; the person then signs in and creates their co-op.
import crypto from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { api, baseUrl, countRows, runScript, signIn, sql } from '../support/api';

/** The script as an operator runs it, with the links' origin set. */
const userCreate = (...args: string[]) => runScript('user-create', args, { APP_URL: baseUrl() });

describe('npm run user:create', () => {
  it('refuses a bad address by field and makes nothing', async () => {
    const before = await countRows('users');
    const r = await userCreate('not-an-address', 'Someone');
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/email: Enter a valid e-mail address/);
    expect(r.stdout).toBe('');
    expect(await countRows('users')).toBe(before);
  });

  it('prints a single-use link; the person chooses a password, signs in and creates their co-op', async () => {
    const email = `founder-${crypto.randomUUID().slice(0, 8)}@example.org`;
    const first = await userCreate(email.toUpperCase(), 'Founding', 'Brewer');
    expect(first.code).toBe(0);
    expect(first.stderr).toContain('account made');
    const link = first.stdout.trim();
    expect(link).toMatch(new RegExp(`^${baseUrl()}/reset-password/[\\w-]+$`));
    const [user] = await sql<{ name: string; password_hash: string | null }>(
      'SELECT name, password_hash FROM users WHERE email = $1',
      [email],
    );
    expect(user).toEqual({ name: 'Founding Brewer', password_hash: null });

    const token = link.split('/').pop()!;
    await api().post(`/api/password-reset/${token}`).send({ password: 'a long founding passphrase' }).expect(200);
    const agent = await signIn(email, 'a long founding passphrase');
    const slug = `founded-${crypto.randomUUID().slice(0, 8)}`;
    const coop = await agent.post('/api/coops').send({ name: 'Founders Fuel Circle', slug }).expect(201);
    const [m] = await sql<{ role: string }>(
      'SELECT m.role FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.coop_id = $1 AND u.email = $2',
      [coop.body.id, email],
    );
    expect(m!.role).toBe('admin');

    // Again for the same person: a fresh link, no second account.
    const again = await userCreate(email, 'Founding Brewer');
    expect(again.code).toBe(0);
    expect(again.stderr).toContain('account exists');
    expect(again.stdout.trim()).not.toBe(link);
    expect(await countRows('users', 'email = $1', [email])).toBe(1);
  });
});
