import { requireMember } from '@/lib/auth';
import { handler, parseQuery } from '@/lib/http';
import { listMembers } from '@/lib/members';
import { memberListQuerySchema } from '@/lib/validation/members';

export const dynamic = 'force-dynamic';

/** GET: the co-op's members, filtered (?role=&status=&q=), sorted and paged by the server. Admins only. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'members:manage');
  const query = parseQuery(req, memberListQuerySchema);
  return listMembers(actor, query);
});
