import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { recordLateLabResult } from '@/lib/lineage';
import { idParam } from '@/lib/validation/id-param';
import { lateLabResultSchema } from '@/lib/validation/lineage';

export const dynamic = 'force-dynamic';

/** POST {labResults}: laboratory results that arrived after release; a failing required property opens a review. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  return recordLateLabResult(actor, batchId, await parseBody(req, lateLabResultSchema));
});
