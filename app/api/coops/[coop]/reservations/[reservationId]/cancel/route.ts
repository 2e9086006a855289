import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';
import { cancelReservation } from '@/lib/tank/reservations';

export const dynamic = 'force-dynamic';

/** POST: cancel an open reservation (your own; brewers/admins anyone's) and release its fuel. */
export const POST = handler<{ coop: string; reservationId: string }>(async (_req, { coop, reservationId }) => {
  const actor = await requireMember(coop, 'reservations:own');
  return cancelReservation(actor, idParam(reservationId, 'Reservation not found.'));
});
