import { requireMember } from '@/lib/auth';
import { listInvoices, memberBalance } from '@/lib/billing/invoices';
import { handler, parseQuery } from '@/lib/http';
import { invoiceListQuerySchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** GET: my own issued invoices and my balance and credit. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'invoices:own');
  const q = parseQuery(req, invoiceListQuerySchema);
  const page = await listInvoices(actor.coop.id, { ...q, membershipId: actor.membershipId, includeDrafts: false });
  return { ...page, balance: await memberBalance(actor.coop.id, actor.membershipId) };
});
