import { requireMember } from '@/lib/auth';
import { acknowledgeDanger } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** POST: a brewer acknowledges the batch's Danger temperature readings (recorded in the audit log). */
export const POST = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  return acknowledgeDanger(actor, idParam(id));
});
