import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { getImport, importerFor } from '@/lib/imports';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** GET: one import with every row's fate and, for invitations, each e-mail's delivery and the progress. */
export const GET = handler<{ coop: string; kind: string; id: string }>(async (_req, { coop, kind, id }) => {
  const actor = await requireMember(coop, 'imports:manage');
  const { kind: k } = importerFor(kind);
  return getImport(actor, k, idParam(id, 'That import is not in this co-op.'));
});
