import { revokeApiToken } from '@/lib/api-tokens';
import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** DELETE — revoke a token (it authenticates nothing from the next request on). */
export const DELETE = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'tokens:manage');
  return revokeApiToken(actor, idParam(id, 'Token not found.'));
});
