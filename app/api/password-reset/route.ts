import { requestPasswordReset, RESET_REQUESTED } from '@/lib/account';
import { handler, parseBody } from '@/lib/http';
import { enqueueMail } from '@/lib/jobs';
import { passwordResetRequestSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/**
 * POST {email}: always the same 202 answer, whether or not an account uses the address. The
 * e-mail is a job the worker sends (one INSERT either way), so the timing does not tell either.
 */
export const POST = handler(async (req) => {
  const { email } = await parseBody(req, passwordResetRequestSchema);
  const mail = await requestPasswordReset(email);
  if (mail) await enqueueMail(mail);
  return Response.json({ message: RESET_REQUESTED }, { status: 202 });
});
