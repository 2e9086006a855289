import { checkPasswordReset, resetPassword } from '@/lib/account';
import { handler, parseBody } from '@/lib/http';
import { passwordResetSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** GET: whether a reset link still works (404 unknown, 410 used or expired). */
export const GET = handler<{ token: string }>(async (_req, { token }) => checkPasswordReset(token));

/** POST {password}: set a new password from the link; single use; ends every session. */
export const POST = handler<{ token: string }>(async (req, { token }) => {
  const input = await parseBody(req, passwordResetSchema);
  return resetPassword(token, input);
});
