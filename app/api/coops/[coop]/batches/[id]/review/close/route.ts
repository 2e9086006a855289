import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { closeReview } from '@/lib/lineage';
import { idParam } from '@/lib/validation/id-param';
import { reviewCloseSchema } from '@/lib/validation/lineage';

export const dynamic = 'force-dynamic';

/** POST {outcome, notes, disposalMethod?, receiptFileId?, retreatBatchId?}: close the batch's open review. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  return closeReview(actor, batchId, await parseBody(req, reviewCloseSchema));
});
