import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';
import { getTank, updateTank } from '@/lib/tank';
import { tankUpdateSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

type P = { coop: string; tankId: string };

/** GET: one tank (any member). PATCH: rename, change capacity, take out of / back into service (brewer/admin). */
export const GET = handler<P>(async (_req, { coop, tankId }) => {
  const actor = await requireMember(coop, 'tank:read');
  return getTank(actor, idParam(tankId, 'Tank not found.'));
});

export const PATCH = handler<P>(async (req, { coop, tankId }) => {
  const actor = await requireMember(coop, 'tank:write');
  const id = idParam(tankId, 'Tank not found.');
  const input = await parseBody(req, tankUpdateSchema);
  return updateTank(actor, id, input);
});
