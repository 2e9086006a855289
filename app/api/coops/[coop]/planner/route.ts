import { requireMemberAnd } from '@/lib/auth';
import { plannerPlan } from '@/lib/batches';
import { handler, lazyJsonBody, parseWith } from '@/lib/http';
import { plannerSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST: compute a batch plan (chemistry, stock coverage, projected cost). Writes nothing. */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const body = lazyJsonBody(req);
  // The session check and the stock reads in one round trip; the body is read and judged only after a session is found.
  const { result } = await requireMemberAnd(coop, 'batches:write', async (actor) => plannerPlan(actor, parseWith(plannerSchema, await body())));
  return result;
});
