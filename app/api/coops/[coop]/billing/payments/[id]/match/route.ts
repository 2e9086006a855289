import { requireMember } from '@/lib/auth';
import { idParam } from '@/lib/validation/id-param';
import { matchPayment } from '@/lib/billing/payments';
import { handler, parseBody } from '@/lib/http';
import { paymentMatchSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {invoiceId|null}: match an unmatched payment to the payer's invoice, or hold it as credit. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const paymentId = idParam(id);
  const { invoiceId } = await parseBody(req, paymentMatchSchema);
  return matchPayment(actor, paymentId, invoiceId);
});
