import 'server-only';
import { Op } from 'sequelize';
import { SignInAttempt } from '@/models';

/** Failed sign-ins allowed per account and per address in the window (common practice). */
export const SIGN_IN_MAX_FAILURES = 10;
export const SIGN_IN_WINDOW_MINUTES = 15;

/** The client's address: the socket's, or the first X-Forwarded-For hop when TRUST_PROXY=1. */
export function clientAddress(headers: Headers): string {
  if (process.env.TRUST_PROXY === '1') {
    const fwd = headers.get('x-forwarded-for')?.split(',')[0]?.trim();
    if (fwd) return fwd.slice(0, 64);
  }
  return (headers.get('x-real-ip') ?? 'local').slice(0, 64);
}

/** True when the account or the address has too many recent failures. */
export async function signInLimited(email: string, address: string): Promise<boolean> {
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MINUTES * 60_000);
  const [byEmail, byAddress] = await Promise.all([
    SignInAttempt.count({ where: { email: email.toLowerCase(), succeeded: false, createdAt: { [Op.gte]: since } } }),
    SignInAttempt.count({ where: { address, succeeded: false, createdAt: { [Op.gte]: since } } }),
  ]);
  return byEmail >= SIGN_IN_MAX_FAILURES || byAddress >= SIGN_IN_MAX_FAILURES;
}

export async function recordSignInAttempt(email: string, address: string, succeeded: boolean): Promise<void> {
  await SignInAttempt.create({ email: email.toLowerCase().slice(0, 254), address, succeeded });
}
