import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { resendInvitation } from '@/lib/members/invitations';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** POST: send a pending invitation again with a new 7-day link (the old link stops working). */
export const POST = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'members:manage');
  return resendInvitation(actor, idParam(id));
});
