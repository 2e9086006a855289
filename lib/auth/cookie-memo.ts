import 'server-only';
import { decode, type JWT, type JWTDecodeParams } from 'next-auth/jwt';

// Decrypting next-auth's session cookie (an HKDF key derivation, then an A256GCM JWE) was the
// largest piece of Node CPU in the session check, paid again on every request by the same
// cookie (bench/README.md, "Batch list and planner within budget"). A cookie's payload is a pure
// function of its bytes (authenticated encryption under the instance's fixed NEXTAUTH_SECRET), so
// an instance may remember what a cookie decrypted to. This is not a session cache: whether the
// session is live — signed out, revoked, idle, the member removed or suspended — is still read
// from the database on every request (lib/auth/queries.ts). Per-instance state: docs/deploy.md.

/** Distinct session cookies an instance remembers (about 1 kB each); the least recently used goes. */
export const COOKIE_MEMO_ENTRIES = 2_000;
/** The clock tolerance next-auth's `decode` gives jose's expiry check, in seconds. */
const CLOCK_TOLERANCE_S = 15;

/**
 * A `decode` for next-auth's `getToken` that remembers decoded payloads per cookie string: the
 * first sight of a cookie is next-auth's own `decode` (which throws for a forged, tampered or
 * expired cookie; nothing is remembered then); later sights return the same payload, frozen,
 * until its `exp` passes (with jose's 15 s tolerance), when next-auth's `decode` decides again.
 */
export function cookieDecodeMemo(maxEntries = COOKIE_MEMO_ENTRIES, nowMs: () => number = Date.now) {
  const decoded = new Map<string, Readonly<JWT> & { exp: number }>();
  return async function decodeSessionCookie(params: JWTDecodeParams): Promise<JWT | null> {
    const { token } = params;
    if (!token) return null;
    const hit = decoded.get(token);
    if (hit) {
      decoded.delete(token);
      // jose refuses a token once `exp <= now - tolerance` (now in whole seconds).
      if (hit.exp > Math.floor(nowMs() / 1000) - CLOCK_TOLERANCE_S) {
        decoded.set(token, hit); // most recently used
        return hit;
      }
    }
    const payload = await decode(params);
    if (!payload || typeof payload.exp !== 'number') return payload;
    const frozen = Object.freeze({ ...payload, exp: payload.exp });
    decoded.set(token, frozen);
    if (decoded.size > maxEntries) decoded.delete(decoded.keys().next().value!);
    return frozen;
  };
}
