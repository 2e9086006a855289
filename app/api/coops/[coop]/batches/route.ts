import { requireMember } from '@/lib/auth';
import { createBatch, listBatches } from '@/lib/brewing';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { batchCreateSchema, batchListSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** GET: batches, one page (?status, page, pageSize, sort, dir); members see released ones. POST: create a planned batch. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'batches:read-released');
  return listBatches(actor, parseQuery(req, batchListSchema));
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'batches:write');
  const input = await parseBody(req, batchCreateSchema);
  return Response.json(await createBatch(actor, input), { status: 201 });
});
