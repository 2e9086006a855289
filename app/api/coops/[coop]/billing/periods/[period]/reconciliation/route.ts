import { requireMember } from '@/lib/auth';
import { periodParam } from '@/lib/billing/params';
import { getReconciliation } from '@/lib/billing/reconciliation';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET: the month's reconciliation (invoices due/paid/outstanding, payments and where they went, checks, what blocks closing). */
export const GET = handler<{ coop: string; period: string }>(async (_req, { coop, period }) => {
  const actor = await requireMember(coop, 'billing:manage');
  return getReconciliation(actor.coop.id, periodParam(period));
});
