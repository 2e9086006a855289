import { requireMemberAnd } from '@/lib/auth';
import { handler } from '@/lib/http';
import { overviewPlan } from '@/lib/overview';

export const dynamic = 'force-dynamic';

/** GET: the co-op's first screen for the signed-in member's role (tank, price, charts, role sections). */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  // The session check and the cards' figures in one round trip.
  const { result } = await requireMemberAnd(coop, 'coop:read', overviewPlan);
  return result;
});
