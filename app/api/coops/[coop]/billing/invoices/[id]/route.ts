import { requireMember } from '@/lib/auth';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET: one invoice with lines, payments and card-attempt state. */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  return getInvoiceDetail(actor.coop.id, idParam(id), { includeDrafts: true });
});
