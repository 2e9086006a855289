import 'server-only';
import { z } from 'zod';
import { emailIs } from '@/lib/auth/email';
import { inTransaction } from '@/lib/db';
import { parseWith } from '@/lib/http';
import { emailSchema, nameSchema } from '@/lib/validation/auth';
import { User } from '@/models';
import { newPasswordResetLink } from './password-reset';

const personSchema = z.strictObject({ email: emailSchema, name: nameSchema });

/**
 * The operator's way in to a new installation (`npm run user:create`, docs/deploy.md): there is
 * no public sign-up, so the first person of a co-op gets their account here. Makes the account
 * for `email` when there is none (no password yet) and answers a single-use link to choose its
 * password, valid as long as a reset link (the same kind of token, so the same page takes it).
 * Nothing is e-mailed: the operator hands the link over. That person then signs in and creates
 * their co-op, becoming its first admin, and invites everyone else.
 * @returns whether the account was made now, the link, and when it expires
 */
export async function accountSetupLink(input: {
  email: string;
  name: string;
}): Promise<{ created: boolean; link: string; expiresAt: Date }> {
  const { email, name } = parseWith(personSchema, input);
  return inTransaction(async (transaction) => {
    const found = await User.findOne({ where: emailIs(email), attributes: ['id'], raw: true, transaction });
    const userId = found?.id ?? (await User.create({ email, name, passwordHash: null }, { transaction })).id;
    return { created: !found, ...(await newPasswordResetLink(userId, transaction)) };
  });
}
