import { requireMember } from '@/lib/auth';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { idParam } from '@/lib/validation/id-param';
import { invoiceFileName, renderInvoicePdf } from '@/lib/billing/pdf';
import { handler } from '@/lib/http';
import { pdfResponse } from '@/lib/pdf';

export const dynamic = 'force-dynamic';

/** GET: the invoice (or draft, marked DRAFT) as a PDF download. */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const inv = await getInvoiceDetail(actor.coop.id, idParam(id), { includeDrafts: true });
  const t0 = performance.now();
  const bytes = await renderInvoicePdf(inv, actor.coop);
  const res = pdfResponse(bytes, invoiceFileName(actor.coop.slug, inv));
  res.headers.set('server-timing', `pdf;dur=${(performance.now() - t0).toFixed(1)}`);
  return res;
});
