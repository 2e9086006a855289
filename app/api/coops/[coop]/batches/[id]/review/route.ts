import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { flagBatch } from '@/lib/lineage';
import { idParam } from '@/lib/validation/id-param';
import { reviewOpenSchema } from '@/lib/validation/lineage';

export const dynamic = 'force-dynamic';

/** POST {finding}: flag a released batch — it goes under review, its fuel is held, the members who drew it are e-mailed. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const { finding } = await parseBody(req, reviewOpenSchema);
  return Response.json(await flagBatch(actor, batchId, finding), { status: 201 });
});
