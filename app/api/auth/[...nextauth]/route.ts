import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';
import { clientAddress, knownDevice, knownDeviceCookie, signInWaitSeconds } from '@/lib/auth/rate-limit';

export const dynamic = 'force-dynamic';

const nextAuth = NextAuth(authOptions);

export const GET = nextAuth;

function minutes(seconds: number): string {
  const m = Math.ceil(seconds / 60);
  return m === 1 ? '1 minute' : `${m} minutes`;
}

/**
 * Sign-in attempts that must wait (lib/auth/rate-limit.ts) are answered 429 before next-auth sees
 * them. A successful sign-in marks the browser as a known device of the account.
 */
export async function POST(req: Request, ctx: { params: Promise<{ nextauth: string[] }> }) {
  const { nextauth } = await ctx.params;
  if (nextauth.join('/') !== 'callback/credentials') return nextAuth(req, ctx);

  const form = await req
    .clone()
    .formData()
    .catch(() => null);
  const email = String(form?.get('email') ?? '')
    .trim()
    .toLowerCase();
  const deviceId = email ? knownDevice(req.headers.get('cookie'), email) : null;
  if (email) {
    const wait = await signInWaitSeconds({ email, address: clientAddress(req.headers), deviceId });
    if (wait > 0) {
      return Response.json(
        { error: `Too many failed sign-ins. Wait ${minutes(wait)} or reset your password.` },
        { status: 429, headers: { 'retry-after': String(wait) } },
      );
    }
  }
  const res: Response = await nextAuth(req, ctx);
  const signedIn = res.headers.getSetCookie().some((c) => /session-token=[^;]/.test(c));
  if (!email || !signedIn) return res;
  const headers = new Headers(res.headers);
  headers.append(
    'set-cookie',
    knownDeviceCookie(
      email,
      deviceId,
      new URL(req.url).protocol === 'https:' || (process.env.NEXTAUTH_URL ?? '').startsWith('https:'),
    ),
  );
  return new Response(res.body, { status: res.status, statusText: res.statusText, headers });
}
