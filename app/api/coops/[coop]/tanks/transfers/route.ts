import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { transferFuel } from '@/lib/tank/transfers';
import { transferCreateSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/** POST: move available fuel from one tank to another at average cost (brewer/admin). */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'tank:write');
  const input = await parseBody(req, transferCreateSchema);
  return Response.json(await transferFuel(actor, input), { status: 201 });
});
