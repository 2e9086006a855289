import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { importerFor } from '@/lib/imports';
import { importFileSchema } from '@/lib/validation/imports';

export const dynamic = 'force-dynamic';

/** POST {fileName, csv}: imports the file in one transaction → 201 {importId, …}; 409 for the same file again. */
export const POST = handler<{ coop: string; kind: string }>(async (req, { coop, kind }) => {
  const actor = await requireMember(coop, 'imports:manage');
  const { importer } = importerFor(kind);
  const input = await parseBody(req, importFileSchema);
  return Response.json(await importer.confirm(actor, input), { status: 201 });
});
