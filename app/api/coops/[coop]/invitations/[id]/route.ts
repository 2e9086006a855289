import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { revokeInvitation } from '@/lib/members/invitations';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** DELETE: revoke a pending invitation; its link then says it was withdrawn. */
export const DELETE = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'members:manage');
  return revokeInvitation(actor, idParam(id));
});
