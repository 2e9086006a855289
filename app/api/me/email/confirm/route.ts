import { confirmEmailChange } from '@/lib/account';
import { handler, parseBody } from '@/lib/http';
import { emailConfirmSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/**
 * POST {token}: confirm a change of e-mail address. Public: the link may be opened on a device
 * where the person is not signed in; the single-use token sent to the new address is the proof.
 */
export const POST = handler(async (req) => {
  const { token } = await parseBody(req, emailConfirmSchema);
  return confirmEmailChange(token);
});
