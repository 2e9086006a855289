import { requireMember } from '@/lib/auth';
import { rejectBatch } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { batchRejectSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST {reason}: reject the batch (from any step that is not final). */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const { reason } = await parseBody(req, batchRejectSchema);
  return rejectBatch(actor, batchId, reason);
});
