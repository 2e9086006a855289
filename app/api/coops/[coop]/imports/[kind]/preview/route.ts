import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { importerFor } from '@/lib/imports';
import { importFileSchema } from '@/lib/validation/imports';

export const dynamic = 'force-dynamic';

/** POST {fileName, csv}: each row's fate if the file were imported now, per row and field. Writes nothing. */
export const POST = handler<{ coop: string; kind: string }>(async (req, { coop, kind }) => {
  const actor = await requireMember(coop, 'imports:manage');
  const { importer } = importerFor(kind);
  const input = await parseBody(req, importFileSchema);
  return importer.preview(actor, input);
});
