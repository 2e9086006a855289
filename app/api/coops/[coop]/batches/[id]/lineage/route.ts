import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { getBatchLineage } from '@/lib/lineage';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** GET: where the batch's fuel went — tanks, draws, members, reviews (brewers, treasurers, admins). */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'lineage:read');
  return getBatchLineage(actor, idParam(id));
});
