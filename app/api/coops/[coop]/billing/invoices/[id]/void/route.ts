import { requireMember } from '@/lib/auth';
import { voidInvoice } from '@/lib/billing/issue';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { invoiceVoidSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {reason}: void an issued invoice by a credit note (409 in a closed month). */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const invoiceId = idParam(id);
  const { reason } = await parseBody(req, invoiceVoidSchema);
  return voidInvoice(actor, invoiceId, reason);
});
