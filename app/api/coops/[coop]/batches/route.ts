import { requireMember, requireMemberAnd } from '@/lib/auth';
import { batchListPlan, createBatch } from '@/lib/batches';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { batchCreateSchema, batchListSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** GET: batches, one page (?status, page, pageSize, sort, dir); members see released ones. POST: create a planned batch. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  // The session check and the page in one round trip; the query string is validated after the session check.
  const { result } = await requireMemberAnd(coop, 'batches:read-released', (actor) => batchListPlan(actor, parseQuery(req, batchListSchema)));
  return result;
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'batches:write');
  const input = await parseBody(req, batchCreateSchema);
  return Response.json(await createBatch(actor, input), { status: 201 });
});
