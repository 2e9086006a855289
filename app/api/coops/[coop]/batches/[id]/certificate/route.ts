import { requireMember } from '@/lib/auth';
import { batchCertificate } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';
import { pdfResponse } from '@/lib/pdf';

export const dynamic = 'force-dynamic';

/** GET: the batch certificate PDF (released batches; members may download). */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:read-released');
  const { bytes, filename } = await batchCertificate(actor, idParam(id));
  return pdfResponse(bytes, filename);
});
