import { requireMember } from '@/lib/auth';
import { addBatchFile, BATCH_FILE_KINDS } from '@/lib/brewing';
import { readUpload } from '@/lib/storage/upload';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** POST (multipart: file, purpose=photo|lab-report): attach a PDF, JPEG or PNG to the batch. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const upload = await readUpload(req, BATCH_FILE_KINDS);
  return Response.json(await addBatchFile(actor, batchId, upload), { status: 201 });
});
