import { requireMember } from '@/lib/auth';
import { idParam } from '@/lib/validation/id-param';
import { retryRefund } from '@/lib/billing/refunds';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** POST: send a pending card refund to the payment service again (same idempotency key). */
export const POST = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  return retryRefund(actor, idParam(id));
});
