import { requireMember } from '@/lib/auth';
import { planBatch } from '@/lib/brewing';
import { handler, parseBody } from '@/lib/http';
import { plannerSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST: compute a batch plan (chemistry, stock coverage, projected cost). Writes nothing. */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'batches:write');
  return planBatch(actor, await parseBody(req, plannerSchema));
});
