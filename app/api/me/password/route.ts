import { changePassword } from '@/lib/account';
import { requireUser } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { passwordChangeSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** POST {currentPassword, newPassword}: change my password; every session ends (sign in again with the new one). */
export const POST = handler(async (req) => {
  const user = await requireUser();
  const input = await parseBody(req, passwordChangeSchema);
  return changePassword(user, input);
});
