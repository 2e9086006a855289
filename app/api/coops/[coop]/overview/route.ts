import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { getOverview } from '@/lib/overview';

export const dynamic = 'force-dynamic';

/** GET: the co-op's first screen for the signed-in member's role (tank, price, charts, role sections). */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'coop:read');
  return getOverview(actor);
});
