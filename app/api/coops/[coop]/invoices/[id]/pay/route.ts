import { requireMember } from '@/lib/auth';
import { payInvoiceByCard } from '@/lib/billing/card';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { cardPaySchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {card}: pay my invoice by card (charged once however often it is sent). */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'invoices:own');
  const invoiceId = idParam(id);
  const { card } = await parseBody(req, cardPaySchema);
  return payInvoiceByCard(actor, invoiceId, card);
});
