import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { importerFor, importTemplateCsv } from '@/lib/imports';

export const dynamic = 'force-dynamic';

/** GET: the kind's CSV template (headings and an example row in the co-op's units and date format). */
export const GET = handler<{ coop: string; kind: string }>(async (_req, { coop, kind }) => {
  const actor = await requireMember(coop, 'imports:manage');
  const { kind: k } = importerFor(kind);
  const { fileName, body } = importTemplateCsv(actor, k);
  return new Response(body, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${fileName}"`,
      'cache-control': 'private, no-store',
    },
  });
});
