import { requireMember } from '@/lib/auth';
import { reverseDraw } from '@/lib/tank/draws/reverse';
import { handler, parseBody } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';
import { drawReverseSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/** POST: reverse a draw with a reason (brewer/admin) — a new negative entry; the original is never edited. */
export const POST = handler<{ coop: string; drawId: string }>(async (req, { coop, drawId }) => {
  const actor = await requireMember(coop, 'draws:record');
  const id = idParam(drawId, 'Draw not found.');
  const input = await parseBody(req, drawReverseSchema);
  return Response.json(await reverseDraw(actor, id, input), { status: 201 });
});
