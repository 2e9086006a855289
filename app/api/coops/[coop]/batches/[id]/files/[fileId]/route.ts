import { requireMember } from '@/lib/auth';
import { getBatchFile } from '@/lib/brewing';
import { fileResponse } from '@/lib/storage/upload';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET: download a batch's photo or lab report (checked against the co-op and the batch). */
export const GET = handler<{ coop: string; id: string; fileId: string }>(async (_req, { coop, id, fileId }) => {
  const actor = await requireMember(coop, 'batches:read-all');
  const file = await getBatchFile(actor, idParam(id), idParam(fileId));
  return fileResponse(file.file, file.kind, file.name);
});
