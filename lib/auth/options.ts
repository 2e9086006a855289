import 'server-only';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { User } from '@/models';
import { signInSchema } from '@/lib/validation/auth';
import { hashPassword, needsRehash, verifyPassword } from './passwords';
import { emailIs } from './email';
import { clientAddress, knownDevice, recordSignInAttempt, signInWaitSeconds } from './rate-limit';
import { revokeSession, SESSION_MAX_AGE_DAYS, startSession } from './sessions';

/**
 * next-auth configuration: e-mail + password, sessions as encrypted JWT cookies that carry the
 * user id and a random session id. Every request re-reads the user together with the session's
 * row (lib/auth/session.ts): signing out revokes the row, so a copied cookie stops working.
 */
export const authOptions: NextAuthOptions = {
  session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_DAYS * 24 * 60 * 60 },
  pages: { signIn: '/sign-in' },
  providers: [
    CredentialsProvider({
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials, req) {
        const parsed = signInSchema.safeParse(credentials);
        if (!parsed.success) return null;
        const { email, password } = parsed.data;
        const headers = new Headers((req?.headers ?? {}) as Record<string, string>);
        const source = { email, address: clientAddress(headers), deviceId: knownDevice(headers.get('cookie'), email) };
        if ((await signInWaitSeconds(source)) > 0) throw new Error('RATE_LIMITED');
        const user = await User.findOne({
          where: emailIs(email),
          attributes: ['id', 'email', 'name', 'passwordHash'],
          raw: true,
        });
        const ok = await verifyPassword(password, user?.passwordHash);
        await recordSignInAttempt(source, ok && !!user);
        if (!user || !ok) return null;
        // Hashes from before argon2id (bcrypt) are replaced now that the password is known.
        if (user.passwordHash && needsRehash(user.passwordHash)) {
          await User.update(
            { passwordHash: await hashPassword(password) },
            { where: { id: user.id, passwordHash: user.passwordHash } },
          );
        }
        const sid = await startSession(user.id, headers.get('user-agent'));
        return { id: String(user.id), email: user.email, name: user.name, sid } as never;
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        const u = user as unknown as { id: string; sid: string };
        token.uid = Number(u.id);
        token.sid = u.sid;
      }
      return token;
    },
    async session({ session, token }) {
      Object.assign(session, { uid: token.uid });
      return session;
    },
  },
  events: {
    /** Sign-out ends this session on the server too: the cookie, even copied, no longer works. */
    async signOut({ token }) {
      if (typeof token?.sid === 'string') await revokeSession(token.sid);
    },
  },
};
