import { requireMember } from '@/lib/auth';
import { planBatch } from '@/lib/batches';
import { handler, parseBody } from '@/lib/http';
import { plannerSchema } from '@/lib/validation/brewing';

/** POST: compute a batch plan (chemistry, stock coverage, projected cost). Writes nothing. */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'batches:write');
  const input = await parseBody(req, plannerSchema);
  return planBatch(actor, input);
});
