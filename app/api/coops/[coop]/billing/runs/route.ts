import { requireMember } from '@/lib/auth';
import { startRun } from '@/lib/billing/run';
import { handler, parseBody } from '@/lib/http';
import { billingRunCreateSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST: start (or join) the invoicing run for a month → 202 with the run; poll GET runs/[id]. */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const input = await parseBody(req, billingRunCreateSchema);
  const { run, started } = await startRun(actor, input);
  return Response.json({ run, started }, { status: started ? 202 : 200 });
});
