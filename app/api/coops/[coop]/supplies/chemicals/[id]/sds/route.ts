import { requireMember } from '@/lib/auth';
import { fileResponse, readUpload } from '@/lib/storage/upload';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';
import { attachSafetyDataSheet, getSafetyDataSheet } from '@/lib/supplies/chemical-lots';

export const dynamic = 'force-dynamic';

/** GET: download the lot's safety data sheet. POST: upload it (multipart, field "file", PDF only). */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'supplies:read');
  const file = await getSafetyDataSheet(actor, idParam(id));
  return fileResponse(file.file, 'pdf', file.name);
});

export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'supplies:write');
  const lotId = idParam(id);
  const upload = await readUpload(req, ['pdf']);
  return Response.json(await attachSafetyDataSheet(actor, lotId, upload), { status: 201 });
});
