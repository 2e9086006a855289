import { after } from 'next/server';
import { requestPasswordReset, RESET_REQUESTED } from '@/lib/account';
import { handler, parseBody } from '@/lib/http';
import { sendMail } from '@/lib/mail';
import { passwordResetRequestSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/**
 * POST {email}: always the same 202 answer, whether or not an account uses the address. The
 * e-mail is sent after the answer, so the timing does not tell either.
 */
export const POST = handler(async (req) => {
  const { email } = await parseBody(req, passwordResetRequestSchema);
  const mail = await requestPasswordReset(email);
  if (mail) after(() => sendMail(mail));
  return Response.json({ message: RESET_REQUESTED }, { status: 202 });
});
