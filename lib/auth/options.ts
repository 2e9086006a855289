import 'server-only';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { User } from '@/models';
import { signInSchema } from '@/lib/validation/auth';
import { verifyPassword } from './passwords';
import { emailIs } from './email';
import { clientAddress, recordSignInAttempt, signInLimited } from './rate-limit';

/**
 * next-auth configuration: e-mail + password, sessions as signed JWT cookies (stateless app
 * instances). The JWT carries only the user id and the session version; every request
 * re-reads both from the database (lib/auth/session.ts).
 */
export const authOptions: NextAuthOptions = {
  session: { strategy: 'jwt', maxAge: 30 * 24 * 60 * 60 },
  pages: { signIn: '/sign-in' },
  providers: [
    CredentialsProvider({
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials, req) {
        const parsed = signInSchema.safeParse(credentials);
        if (!parsed.success) return null;
        const { email, password } = parsed.data;
        const address = clientAddress(new Headers((req?.headers ?? {}) as Record<string, string>));
        if (await signInLimited(email, address)) throw new Error('RATE_LIMITED');
        const user = await User.findOne({ where: emailIs(email), attributes: ['id', 'email', 'name', 'passwordHash', 'sessionVersion'], raw: true });
        const ok = await verifyPassword(password, user?.passwordHash);
        await recordSignInAttempt(email, address, ok && !!user);
        if (!user || !ok) return null;
        return { id: String(user.id), email: user.email, name: user.name, sv: user.sessionVersion } as never;
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        const u = user as unknown as { id: string; sv: number };
        token.uid = Number(u.id);
        token.sv = u.sv;
      }
      return token;
    },
    async session({ session, token }) {
      Object.assign(session, { uid: token.uid, sv: token.sv });
      return session;
    },
  },
};
