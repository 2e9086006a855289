import { requireMember } from '@/lib/auth';
import { listDraws } from '@/lib/tank/draws';
import { drawRecorderScope, recordDraw } from '@/lib/tank/draws/record';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { drawCreateSchema, drawListSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/**
 * GET: draws with totals (a member sees their own; brewers, treasurers, admins all, with filters).
 * POST: record a draw (brewer/admin; a member for themself when the co-op has a self-serve pump).
 */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'reservations:own');
  return listDraws(actor, parseQuery(req, drawListSchema));
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'reservations:own');
  drawRecorderScope(actor);
  const input = await parseBody(req, drawCreateSchema);
  return Response.json(await recordDraw(actor, input), { status: 201 });
});
