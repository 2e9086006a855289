import { requireMember } from '@/lib/auth';
import { idParam } from '@/lib/validation/id-param';
import { getRun } from '@/lib/billing/run';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** GET: a run's progress (total / done members, drafts, status). */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  return { run: await getRun(actor, idParam(id)) };
});
