import { requireMember } from '@/lib/auth';
import { handler, parseQuery } from '@/lib/http';
import { getRecallReport, recallCsv, recallPdf } from '@/lib/lineage';
import { pdfResponse } from '@/lib/pdf';
import { idParam } from '@/lib/validation/id-param';
import { recallReportQuerySchema } from '@/lib/validation/lineage';

export const dynamic = 'force-dynamic';

/** GET ?format=json|csv|pdf — the batch's recall report (brewers, treasurers, admins). */
export const GET = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'lineage:read');
  const batchId = idParam(id);
  const { format = 'json' } = parseQuery(req, recallReportQuerySchema);
  const report = await getRecallReport(actor, batchId);
  const name = `${actor.coop.slug}-recall-batch-${report.number}`;
  if (format === 'csv') {
    return new Response(recallCsv(report), {
      headers: {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': `attachment; filename="${name}.csv"`,
        'cache-control': 'private, no-store',
      },
    });
  }
  if (format === 'pdf') return pdfResponse(await recallPdf(report), `${name}.pdf`);
  return report;
});
