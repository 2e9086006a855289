import { requireMember } from '@/lib/auth';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { idParam } from '@/lib/validation/id-param';
import { invoiceFileName, renderInvoicePdf } from '@/lib/billing/pdf';
import { handler } from '@/lib/http';
import { pdfResponse } from '@/lib/pdf';

export const dynamic = 'force-dynamic';

/** GET: one of my invoices as a PDF download. */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'invoices:own');
  const inv = await getInvoiceDetail(actor.coop.id, idParam(id), { membershipId: actor.membershipId, includeDrafts: false });
  return pdfResponse(await renderInvoicePdf(inv, actor.coop), invoiceFileName(actor.coop.slug, inv));
});
