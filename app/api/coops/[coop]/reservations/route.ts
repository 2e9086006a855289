import { requireMember } from '@/lib/auth';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { createReservation, listReservations } from '@/lib/tank/reservations';
import { reservationCreateSchema, reservationListSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/**
 * GET: reservations (a member sees their own; brewers, treasurers and admins all, with filters).
 * POST: reserve fuel for yourself; 409 { error, availableLiters, available } when the tank can't cover it.
 */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'reservations:own');
  return listReservations(actor, parseQuery(req, reservationListSchema));
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'reservations:own');
  const input = await parseBody(req, reservationCreateSchema);
  return Response.json(await createReservation(actor, input), { status: 201 });
});
