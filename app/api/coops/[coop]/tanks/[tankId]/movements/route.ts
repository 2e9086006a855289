import { requireMember } from '@/lib/auth';
import { handler, parseQuery } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';
import { listMovements } from '@/lib/tank/movements';
import { movementListSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/** GET: a tank's ledger, paged and sorted on the server (?page=&pageSize=&sort=&dir=&kind=) — brewers, treasurers, admins. */
export const GET = handler<{ coop: string; tankId: string }>(async (req, { coop, tankId }) => {
  const actor = await requireMember(coop, 'draws:read-all');
  const id = idParam(tankId, 'Tank not found.');
  return listMovements(actor, id, parseQuery(req, movementListSchema));
});
