// No silent password truncation: argon2id reads the whole password; bcrypt hashes (which read
// only 72 bytes) are upgraded to argon2id at the next successful sign-in.
import bcrypt from 'bcryptjs';
import { afterAll, describe, expect, it } from 'vitest';
import { makeUser, signIn, sql, TEST_PASSWORD } from '../support/api';

const LONG = 'a'.repeat(72) + 'correct-horse-battery-st'; // 96 characters
const LONG_97 = LONG + '1';
const SAME_72 = 'a'.repeat(72) + 'something-else-entirely-';

describe('password hashing', () => {
  afterAll(async () => {
    await sql('DELETE FROM sign_in_attempts WHERE NOT succeeded');
  });

  it('a 97-character password differing after byte 72 does not sign in', async () => {
    expect(LONG_97).toHaveLength(97);
    const u = await makeUser();
    const agent = await signIn(u.email);
    await agent.post('/api/me/password').send({ currentPassword: TEST_PASSWORD, newPassword: LONG_97 }).expect(200);
    const [row] = await sql<{ password_hash: string }>('SELECT password_hash FROM users WHERE id = $1', [u.id]);
    expect(row!.password_hash).toMatch(/^\$argon2id\$/);
    await expect(signIn(u.email, SAME_72 + '1')).rejects.toThrow(/sign-in failed/);
    await signIn(u.email, LONG_97);
  });

  it('an old bcrypt hash never matches a longer password that shares its first 72 bytes', async () => {
    const u = await makeUser();
    await sql('UPDATE users SET password_hash = $2 WHERE id = $1', [u.id, bcrypt.hashSync(LONG_97, 10)]);
    await expect(signIn(u.email, SAME_72 + '1')).rejects.toThrow(/sign-in failed/);
  });

  it('a bcrypt hash is upgraded to argon2id at sign-in', async () => {
    const u = await makeUser(); // test users are made with a bcrypt hash
    const [before] = await sql<{ password_hash: string }>('SELECT password_hash FROM users WHERE id = $1', [u.id]);
    expect(before!.password_hash).toMatch(/^\$2[aby]\$/);
    await signIn(u.email);
    const [after] = await sql<{ password_hash: string }>('SELECT password_hash FROM users WHERE id = $1', [u.id]);
    expect(after!.password_hash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
    await signIn(u.email); // and the new hash verifies
  });
});
