import 'server-only';
import { Op } from 'sequelize';
import { SignInAttempt } from '@/models';
import { emailIs } from './email';

/** Failed sign-ins allowed per account and per address in the window (common practice). */
export const SIGN_IN_MAX_FAILURES = 10;
export const SIGN_IN_WINDOW_MINUTES = 15;

/** Stored for attempts whose address is not known (no trusted proxy in front of the app). */
export const UNKNOWN_ADDRESS = 'unknown';

/**
 * The client's address, or null when it cannot be known. Next.js route handlers do not see the
 * socket, and any X-Forwarded-For / X-Real-IP header may have been written by the client itself,
 * so an address is trusted only behind our own proxy (TRUST_PROXY=1), which APPENDS the address
 * it saw: the last hop is the one to believe. Without a proxy only the per-account limit
 * applies; a shared made-up address would let anyone lock every account out at once.
 */
export function clientAddress(headers: Headers): string | null {
  if (process.env.TRUST_PROXY !== '1') return null;
  const hops = headers.get('x-forwarded-for')?.split(',').map((h) => h.trim()).filter(Boolean) ?? [];
  const address = hops.at(-1) ?? headers.get('x-real-ip')?.trim();
  return address ? address.slice(0, 64) : null;
}

/** True when the account, or the address when known, has too many recent failures. */
export async function signInLimited(email: string, address: string | null): Promise<boolean> {
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MINUTES * 60_000);
  const [byEmail, byAddress] = await Promise.all([
    SignInAttempt.count({ where: { [Op.and]: [emailIs(email), { succeeded: false, createdAt: { [Op.gte]: since } }] } }),
    address ? SignInAttempt.count({ where: { address, succeeded: false, createdAt: { [Op.gte]: since } } }) : Promise.resolve(0),
  ]);
  return byEmail >= SIGN_IN_MAX_FAILURES || byAddress >= SIGN_IN_MAX_FAILURES;
}

export async function recordSignInAttempt(email: string, address: string | null, succeeded: boolean): Promise<void> {
  await SignInAttempt.create({ email: email.toLowerCase().slice(0, 254), address: address ?? UNKNOWN_ADDRESS, succeeded });
}
