import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { removeMembership, updateMembership } from '@/lib/members';
import { idParam } from '@/lib/validation/id-param';
import { membershipUpdateSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** PATCH {role?, status?}: change a member's role, suspend or reinstate. 409 for the last active admin. */
export const PATCH = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'members:manage');
  const membershipId = idParam(id);
  const input = await parseBody(req, membershipUpdateSchema);
  return updateMembership(actor, membershipId, input);
});

/** DELETE: remove a member from the co-op (their account stays). 409 for the last active admin. */
export const DELETE = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'members:manage');
  return removeMembership(actor, idParam(id));
});
