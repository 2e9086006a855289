import { requireMember } from '@/lib/auth';
import { periodParam } from '@/lib/billing/params';
import { closePeriod } from '@/lib/billing/reconciliation';
import { handler, parseBody } from '@/lib/http';
import { periodCloseSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {confirm:true}: close and lock the month (409 with `blockers` while it cannot be closed). */
export const POST = handler<{ coop: string; period: string }>(async (req, { coop, period }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const p = periodParam(period);
  await parseBody(req, periodCloseSchema);
  return closePeriod(actor, p);
});
