import { requireMember } from '@/lib/auth';
import { getBatch, updateBatch } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { batchUpdateSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** GET: the batch record (members: a released batch's quality summary). PATCH: record step data. */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:read-released');
  return getBatch(actor, idParam(id), { allowSummary: true });
});

export const PATCH = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const input = await parseBody(req, batchUpdateSchema);
  return updateBatch(actor, batchId, input);
});
