import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { listTankLayers } from '@/lib/lineage';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** GET: the tank's fuel by batch, oldest first, its mixing model and what is held (any member). */
export const GET = handler<{ coop: string; tankId: string }>(async (_req, { coop, tankId }) => {
  const actor = await requireMember(coop, 'tank:read');
  return listTankLayers(actor, idParam(tankId));
});
