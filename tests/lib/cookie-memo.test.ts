import { encode } from 'next-auth/jwt';
import { describe, expect, it } from 'vitest';
import { cookieDecodeMemo } from '@/lib/auth/cookie-memo';

// The per-process memo of decoded session cookies (lib/auth/cookie-memo.ts): the same answers as
// next-auth's own `decode`, which it calls on every first sight and after a payload's expiry.
const secret = 'test-secret-of-at-least-32-characters-long';
const cookie = (claims: Record<string, unknown>, maxAge = 3600) => encode({ token: claims, secret, maxAge });

describe('cookieDecodeMemo (decoded session cookies, per process)', () => {
  it("returns next-auth's payload, and the same one again without decrypting", async () => {
    const decodeCookie = cookieDecodeMemo();
    const token = await cookie({ uid: 6, sid: 'abc' });
    const first = await decodeCookie({ token, secret });
    expect(first).toMatchObject({ uid: 6, sid: 'abc' });
    expect(Object.isFrozen(first)).toBe(true);
    // A wrong secret would make next-auth's decode throw: a remembered cookie does not decrypt again.
    expect(await decodeCookie({ token, secret: 'another-secret-of-at-least-32-characters' })).toBe(first);
  });

  it('remembers nothing for a tampered or missing cookie', async () => {
    const decodeCookie = cookieDecodeMemo();
    const token = await cookie({ uid: 6, sid: 'abc' });
    const tampered = token.slice(0, -3) + (token.endsWith('A') ? 'BBB' : 'AAA');
    await expect(decodeCookie({ token: tampered, secret })).rejects.toThrow();
    await expect(decodeCookie({ token: tampered, secret })).rejects.toThrow();
    expect(await decodeCookie({ token: '', secret })).toBeNull();
  });

  it("lets next-auth decide again once the payload's exp has passed (with jose's 15 s tolerance)", async () => {
    let now = Date.now();
    const decodeCookie = cookieDecodeMemo(10, () => now);
    const token = await cookie({ uid: 6, sid: 'abc' }, 60);
    const first = await decodeCookie({ token, secret });
    const exp = (first as { exp: number }).exp;
    now = (exp + 14) * 1000;
    expect(await decodeCookie({ token, secret })).toBe(first);
    now = (exp + 15) * 1000;
    // Past the tolerance the memo asks next-auth, whose jose check (real clock) still accepts this
    // cookie; with a wrong secret the answer shows that it decrypted again instead of remembering.
    await expect(decodeCookie({ token, secret: 'another-secret-of-at-least-32-characters' })).rejects.toThrow();
  });

  it('keeps at most maxEntries cookies, dropping the least recently used', async () => {
    const decodeCookie = cookieDecodeMemo(2);
    const wrong = 'another-secret-of-at-least-32-characters';
    const [a, b, c] = await Promise.all([1, 2, 3].map((uid) => cookie({ uid, sid: 's' })));
    await decodeCookie({ token: a!, secret });
    await decodeCookie({ token: b!, secret });
    await decodeCookie({ token: a!, secret }); // a is now the most recent
    await decodeCookie({ token: c!, secret }); // b goes
    expect(await decodeCookie({ token: a!, secret: wrong })).toMatchObject({ uid: 1 });
    expect(await decodeCookie({ token: c!, secret: wrong })).toMatchObject({ uid: 3 });
    await expect(decodeCookie({ token: b!, secret: wrong })).rejects.toThrow();
  });
});
