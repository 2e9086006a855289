import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { importerFor, undoImportOf } from '@/lib/imports';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** POST: undoes the import as a whole (one transaction); 409 once something builds on it, or for invitations. */
export const POST = handler<{ coop: string; kind: string; id: string }>(async (_req, { coop, kind, id }) => {
  const actor = await requireMember(coop, 'imports:manage');
  const { kind: k, importer } = importerFor(kind);
  return undoImportOf(actor, k, importer, idParam(id, 'That import is not in this co-op.'));
});
