import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';
import { recordDip } from '@/lib/tank/dips';
import { dipCreateSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/** POST: a dip reading; a difference from the book becomes a gain/loss ledger row (brewer/admin). */
export const POST = handler<{ coop: string; tankId: string }>(async (req, { coop, tankId }) => {
  const actor = await requireMember(coop, 'tank:write');
  const id = idParam(tankId, 'Tank not found.');
  const input = await parseBody(req, dipCreateSchema);
  return Response.json(await recordDip(actor, id, input), { status: 201 });
});
