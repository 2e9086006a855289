import { requireMember } from '@/lib/auth';
import { idParam } from '@/lib/validation/id-param';
import { refundPayment } from '@/lib/billing/refunds';
import { handler, parseBody } from '@/lib/http';
import { refundCreateSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {amount, reason}: refund money held for the member (card: through the payment service). */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const paymentId = idParam(id);
  const { amount, reason } = await parseBody(req, refundCreateSchema);
  return Response.json(await refundPayment(actor, paymentId, { amountCents: amount, reason }), { status: 201 });
});
