import { requireMember } from '@/lib/auth';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { idParam } from '@/lib/validation/id-param';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET: one of my invoices (someone else's is a 404). */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'invoices:own');
  return getInvoiceDetail(actor.coop.id, idParam(id), { membershipId: actor.membershipId, includeDrafts: false });
});
