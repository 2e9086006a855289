import { getProfile, updateProfile } from '@/lib/account';
import { requireUser, touchCurrentSession } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { profileUpdateSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** GET: my name, e-mail, any pending e-mail change and my co-ops with role. */
export const GET = handler(async () => getProfile(await requireUser()));

/** PATCH {name}: rename myself. */
export const PATCH = handler(async (req) => {
  const user = await requireUser();
  const input = await parseBody(req, profileUpdateSchema);
  const result = await updateProfile(user, input);
  await touchCurrentSession();
  return result;
});
