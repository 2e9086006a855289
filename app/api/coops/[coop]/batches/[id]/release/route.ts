import { requireMember } from '@/lib/auth';
import { releaseBatch } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { batchReleaseSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST {tankId, volume}: release a tested batch into a tank (consumes chemical lots, prices the batch). */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const input = await parseBody(req, batchReleaseSchema);
  return releaseBatch(actor, batchId, input);
});
