import 'server-only';
import crypto from 'node:crypto';
import { col, fn, Op, type WhereOptions } from 'sequelize';
import { SignInAttempt } from '@/models';
import { emailIs } from './email';

/**
 * Sign-in throttling that cannot be turned against the owner.
 *
 * Failed attempts are counted over the last day, separately per account, per client address
 * (only when it can be known, see `clientAddress`) and per known device. The first
 * SIGN_IN_FREE_FAILURES failures cost nothing; after that every further failure doubles the wait
 * before the next attempt is even checked: 15 minutes after the 10th, 30 after the 11th, 60 after
 * the 12th … at most a day. Attempts during the wait get 429 with Retry-After and are not counted.
 *
 * A device that signed in to the account before carries a signed "known device" cookie
 * (`tallyvat-device`, 180 days, HttpOnly, only sent to /api/auth). Its attempts skip the
 * account's and the address's counts and have their own, the same back-off per device: an
 * attacker hammering the account from elsewhere locks only themselves out, and the owner's own
 * mistakes do not lock the account for everyone else.
 */
export const SIGN_IN_FREE_FAILURES = 10;
export const SIGN_IN_FIRST_WAIT_MINUTES = 15;
const MAX_WAIT_MS = 24 * 60 * 60 * 1000;
const COUNT_WINDOW_MS = 24 * 60 * 60 * 1000;

/** Stored for attempts whose address is not known (no trusted proxy in front of the app). */
export const UNKNOWN_ADDRESS = 'unknown';

/**
 * The client's address, or null when it cannot be known. Next.js route handlers do not see the
 * socket, and any X-Forwarded-For / X-Real-IP header may have been written by the client itself,
 * so an address is trusted only behind our own proxy (TRUST_PROXY=1), which APPENDS the address
 * it saw: the last hop is the one to believe. Without a proxy the per-address limit is off (a
 * shared made-up address would let anyone lock every account out at once); the per-account
 * back-off applies, and the known-device cookie is the owner's way in during an attack.
 */
export function clientAddress(headers: Headers): string | null {
  if (process.env.TRUST_PROXY !== '1') return null;
  const hops =
    headers
      .get('x-forwarded-for')
      ?.split(',')
      .map((h) => h.trim())
      .filter(Boolean) ?? [];
  const address = hops.at(-1) ?? headers.get('x-real-ip')?.trim();
  return address ? address.slice(0, 64) : null;
}

// ---- known-device cookie ---------------------------------------------------------------------

export const DEVICE_COOKIE = 'tallyvat-device';
const DEVICE_DAYS = 180;

function secret(): string {
  const s = process.env.NEXTAUTH_SECRET;
  if (!s) throw new Error('NEXTAUTH_SECRET is not set');
  return s;
}

const mac = (deviceId: string, email: string, expires: number) =>
  crypto
    .createHmac('sha256', secret())
    .update(`known-device\n${deviceId}\n${email.toLowerCase()}\n${expires}`)
    .digest('base64url');

function cookieValue(cookieHeader: string | null | undefined, name: string): string | null {
  for (const part of String(cookieHeader ?? '').split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return null;
}

/** The device id of a valid known-device cookie for this account, or null. */
export function knownDevice(cookieHeader: string | null | undefined, email: string): string | null {
  const [deviceId, expires, signature] = (cookieValue(cookieHeader, DEVICE_COOKIE) ?? '').split('.');
  if (!deviceId || !expires || !signature || !/^[A-Za-z0-9_-]{22}$/.test(deviceId)) return null;
  const exp = Number(expires);
  if (!Number.isInteger(exp) || exp * 1000 < Date.now()) return null;
  const expected = Buffer.from(mac(deviceId, email, exp));
  const given = Buffer.from(signature);
  return expected.length === given.length && crypto.timingSafeEqual(expected, given) ? deviceId : null;
}

/** The Set-Cookie header marking this browser as a known device of the account (kept id when it had one). */
export function knownDeviceCookie(email: string, deviceId: string | null, secure: boolean): string {
  const id = deviceId ?? crypto.randomBytes(16).toString('base64url');
  const exp = Math.floor(Date.now() / 1000) + DEVICE_DAYS * 24 * 60 * 60;
  return [
    `${DEVICE_COOKIE}=${id}.${exp}.${mac(id, email, exp)}`,
    `Max-Age=${DEVICE_DAYS * 24 * 60 * 60}`,
    'Path=/api/auth',
    'HttpOnly',
    'SameSite=Strict',
    ...(secure ? ['Secure'] : []),
  ].join('; ');
}

// ---- back-off ---------------------------------------------------------------------------------

/** How long to wait after `failures` failures, the last one at `last`; 0 when free to try. */
function waitMs(failures: number, last: Date | null): number {
  if (failures < SIGN_IN_FREE_FAILURES || !last) return 0;
  const wait = Math.min(SIGN_IN_FIRST_WAIT_MINUTES * 60_000 * 2 ** (failures - SIGN_IN_FREE_FAILURES), MAX_WAIT_MS);
  return Math.max(0, new Date(last).getTime() + wait - Date.now());
}

async function waitFor(where: WhereOptions<SignInAttempt>): Promise<number> {
  const row = (await SignInAttempt.findOne({
    where: { [Op.and]: [where, { succeeded: false, createdAt: { [Op.gte]: new Date(Date.now() - COUNT_WINDOW_MS) } }] },
    attributes: [
      [fn('count', col('id')), 'failures'],
      [fn('max', col('created_at')), 'last'],
    ],
    raw: true,
  })) as unknown as { failures: string; last: Date | null } | null;
  return waitMs(Number(row?.failures ?? 0), row?.last ?? null);
}

/** Who is trying: the account, the client's address when known, and the known device if any. */
export interface SignInSource {
  email: string;
  address: string | null;
  deviceId: string | null;
}

/**
 * Seconds to wait before this attempt may be checked, or 0. A known device is throttled on its
 * own; anyone else by the account and (when known) the address.
 */
export async function signInWaitSeconds({ email, address, deviceId }: SignInSource): Promise<number> {
  const waits = deviceId
    ? [await waitFor({ deviceId })]
    : await Promise.all([
        waitFor({ [Op.and]: [emailIs(email), { deviceId: null, address: { [Op.ne]: IN_SESSION } }] }),
        address ? waitFor({ address, deviceId: null }) : Promise.resolve(0),
      ]);
  return Math.ceil(Math.max(...waits) / 1000);
}

export async function recordSignInAttempt(
  { email, address, deviceId }: SignInSource,
  succeeded: boolean,
): Promise<void> {
  await SignInAttempt.create({
    email: email.toLowerCase().slice(0, 254),
    address: address ?? UNKNOWN_ADDRESS,
    deviceId,
    succeeded,
  });
}

// ---- current password inside a session -------------------------------------------------------

/** The `address` of a current-password check made inside a session (e-mail or password change). */
const IN_SESSION = 'in-session';
export const CURRENT_PASSWORD_MAX_FAILURES = 5;
export const CURRENT_PASSWORD_WINDOW_MINUTES = 15;

/** Seconds until the user may try their current password again inside a session, or 0 (5 wrong per 15 minutes). */
export async function currentPasswordWaitSeconds(email: string): Promise<number> {
  const since = new Date(Date.now() - CURRENT_PASSWORD_WINDOW_MINUTES * 60_000);
  const rows = await SignInAttempt.findAll({
    where: { [Op.and]: [emailIs(email), { address: IN_SESSION, succeeded: false, createdAt: { [Op.gte]: since } }] },
    attributes: ['createdAt'],
    order: [['createdAt', 'DESC']],
    limit: CURRENT_PASSWORD_MAX_FAILURES,
    raw: true,
  });
  if (rows.length < CURRENT_PASSWORD_MAX_FAILURES) return 0;
  const oldest = new Date(rows.at(-1)!.createdAt).getTime();
  return Math.max(1, Math.ceil((oldest + CURRENT_PASSWORD_WINDOW_MINUTES * 60_000 - Date.now()) / 1000));
}

export async function recordCurrentPasswordFailure(email: string): Promise<void> {
  await SignInAttempt.create({
    email: email.toLowerCase().slice(0, 254),
    address: IN_SESSION,
    deviceId: null,
    succeeded: false,
  });
}
