import 'server-only';
import hkdf from '@panva/hkdf';
import { jwtDecrypt } from 'jose';
import { cookies } from 'next/headers';

/**
 * Reads next-auth's session cookie without next-auth's per-request work: the encryption key
 * (HKDF of NEXTAUTH_SECRET, exactly as next-auth derives it) is computed once per process, and
 * the cookie is only decrypted, not re-issued. Sign-in and sign-out still go through next-auth.
 */
let cached: { secret: string; key: Promise<Uint8Array> } | null = null;

function encryptionKey(secret: string): Promise<Uint8Array> {
  if (cached?.secret !== secret) {
    cached = { secret, key: hkdf('sha256', secret, '', 'NextAuth.js Generated Encryption Key', 32) };
  }
  return cached.key;
}

function cookieName(): string {
  return (process.env.NEXTAUTH_URL ?? '').startsWith('https://') ? '__Secure-next-auth.session-token' : 'next-auth.session-token';
}

const CLOCK_TOLERANCE_S = 15;

/**
 * Cookies already decrypted in this process → their claims and expiry. Decryption is a pure
 * function of the cookie and the secret, so a signed-in user's next requests skip it; the
 * session version and membership are still read from the database on every request.
 */
const decrypted = new Map<string, { secret: string; claims: SessionClaims; exp: number }>();
const DECRYPTED_MAX = 10_000;

export interface SessionClaims {
  uid: number;
  sv: number;
}

/** The user id and session version from the signed-in cookie, or null. */
export async function readSessionCookie(): Promise<SessionClaims | null> {
  const secret = process.env.NEXTAUTH_SECRET ?? process.env.AUTH_SECRET;
  if (!secret) return null;
  const jar = await cookies();
  const name = cookieName();
  // next-auth splits cookies over 4 KB into name.0, name.1, …
  let token = jar.get(name)?.value;
  if (!token) {
    const chunks = jar.getAll().filter((c) => c.name.startsWith(`${name}.`)).sort((a, b) => Number(a.name.split('.').pop()) - Number(b.name.split('.').pop()));
    token = chunks.map((c) => c.value).join('') || undefined;
  }
  if (!token) return null;
  const now = Date.now() / 1000;
  const known = decrypted.get(token);
  if (known && known.secret === secret) return known.exp + CLOCK_TOLERANCE_S > now ? known.claims : null;
  try {
    const { payload } = await jwtDecrypt(token, await encryptionKey(secret), { clockTolerance: CLOCK_TOLERANCE_S });
    const uid = Number(payload.uid);
    const sv = Number(payload.sv);
    const claims = Number.isInteger(uid) && uid > 0 && Number.isInteger(sv) ? { uid, sv } : null;
    if (claims && typeof payload.exp === 'number') {
      if (decrypted.size >= DECRYPTED_MAX) decrypted.clear();
      decrypted.set(token, { secret, claims, exp: payload.exp });
    }
    return claims;
  } catch {
    return null;
  }
}
