import { requireMember } from '@/lib/auth';
import { advanceBatch } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { batchAdvanceSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST {to}: move the batch forward to a later step. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const { to } = await parseBody(req, batchAdvanceSchema);
  return advanceBatch(actor, batchId, to);
});
