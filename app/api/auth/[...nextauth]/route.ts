import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';
import { clientAddress, signInLimited, SIGN_IN_WINDOW_MINUTES } from '@/lib/auth/rate-limit';

export const dynamic = 'force-dynamic';

const nextAuth = NextAuth(authOptions);

export const GET = nextAuth;

/** Sign-in attempts over the limit are answered 429 before next-auth sees them. */
export async function POST(req: Request, ctx: { params: Promise<{ nextauth: string[] }> }) {
  const { nextauth } = await ctx.params;
  if (nextauth.join('/') === 'callback/credentials') {
    const form = await req.clone().formData().catch(() => null);
    const email = String(form?.get('email') ?? '').trim().toLowerCase();
    if (email && (await signInLimited(email, clientAddress(req.headers)))) {
      return Response.json(
        { error: `Too many failed sign-ins. Wait ${SIGN_IN_WINDOW_MINUTES} minutes or reset your password.` },
        { status: 429, headers: { 'retry-after': String(SIGN_IN_WINDOW_MINUTES * 60) } },
      );
    }
  }
  return nextAuth(req, ctx);
}
