import { requireMember } from '@/lib/auth';
import { getPeriodOverview } from '@/lib/billing/months';
import { periodParam } from '@/lib/billing/params';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET: the month at a glance (run progress, invoice counts, e-mail state, totals); polled by the month page. */
export const GET = handler<{ coop: string; period: string }>(async (_req, { coop, period }) => {
  const actor = await requireMember(coop, 'billing:manage');
  return getPeriodOverview(actor.coop.id, periodParam(period));
});
