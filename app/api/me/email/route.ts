import { requestEmailChange } from '@/lib/account';
import { requireUser, touchCurrentSession } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { emailChangeSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/**
 * POST {email, currentPassword}: e-mail a confirmation link to the new address; the address
 * changes when it is opened. 202 whether or not another account uses the address.
 */
export const POST = handler(async (req) => {
  const user = await requireUser();
  const input = await parseBody(req, emailChangeSchema);
  const result = await requestEmailChange(user, input);
  await touchCurrentSession();
  return Response.json(result, { status: 202 });
});
