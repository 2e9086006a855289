import { requireMember } from '@/lib/auth';
import { listInvoices } from '@/lib/billing/invoices';
import { handler, parseQuery } from '@/lib/http';
import { invoiceListQuerySchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** GET ?period=&status=&page=&pageSize=&sort=&dir=: the co-op's invoices, drafts included. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const q = parseQuery(req, invoiceListQuerySchema);
  return listInvoices(actor.coop.id, { ...q, includeDrafts: true });
});
