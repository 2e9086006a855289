import { requireMemberAnd } from '@/lib/auth';
import { plannerPlan } from '@/lib/batches';
import { handler, parseWith, readJson } from '@/lib/http';
import { plannerSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST: compute a batch plan (chemistry, stock coverage, projected cost). Writes nothing. */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const body = await readJson(req);
  // The session check and the stock reads in one round trip; the body is judged after the session check.
  const { result } = await requireMemberAnd(coop, 'batches:write', (actor) => plannerPlan(actor, parseWith(plannerSchema, body())));
  return result;
});
