import { requireMember } from '@/lib/auth';
import { handler, parseQuery } from '@/lib/http';
import { pdfResponse } from '@/lib/pdf';
import { getQuarterlyReport } from '@/lib/reports/quarterly';
import { quarterlyCsv, quarterlyPdf } from '@/lib/reports/quarterly-export';
import { quarterlyReportQuerySchema } from '@/lib/validation/reports';

export const dynamic = 'force-dynamic';

/** GET ?year=&quarter=&format=json|csv|pdf — the quarterly fuel-volume report (treasurers, admins). */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'reports:read');
  const { format, ...q } = parseQuery(req, quarterlyReportQuerySchema);
  const report = await getQuarterlyReport(actor, q);
  const name = `${actor.coop.slug}-fuel-volumes-${q.year}-q${q.quarter}`;
  if (format === 'csv') {
    return new Response(quarterlyCsv(report), {
      headers: {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': `attachment; filename="${name}.csv"`,
        'cache-control': 'private, no-store',
      },
    });
  }
  if (format === 'pdf') return pdfResponse(await quarterlyPdf(report), `${name}.pdf`);
  return report;
});
