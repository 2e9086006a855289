import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { stockSummary } from '@/lib/supplies/stock';

export const dynamic = 'force-dynamic';

/** GET: stock on hand per chemical, committed to batches under way, and the low-stock flags. */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'supplies:read');
  return stockSummary(actor);
});
