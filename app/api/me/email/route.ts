import { requestEmailChange } from '@/lib/account';
import { requireUser } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { emailChangeSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** POST {email, currentPassword}: e-mail a confirmation link to the new address; the address changes when it is opened. */
export const POST = handler(async (req) => {
  const user = await requireUser();
  const input = await parseBody(req, emailChangeSchema);
  return Response.json(await requestEmailChange(user, input), { status: 202 });
});
