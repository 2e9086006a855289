import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { importerFor, importResultCsv } from '@/lib/imports';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** GET: the import's result as a CSV download (every row, its fate and, for invitations, the e-mail's delivery). */
export const GET = handler<{ coop: string; kind: string; id: string }>(async (_req, { coop, kind, id }) => {
  const actor = await requireMember(coop, 'imports:manage');
  const { kind: k, importer } = importerFor(kind);
  const { fileName, body } = await importResultCsv(
    actor,
    k,
    idParam(id, 'That import is not in this co-op.'),
    importer,
  );
  return new Response(body, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${fileName}"`,
      'cache-control': 'private, no-store',
    },
  });
});
