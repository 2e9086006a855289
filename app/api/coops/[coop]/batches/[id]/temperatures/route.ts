import { requireMember } from '@/lib/auth';
import { addTemperature } from '@/lib/brewing';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { temperatureCreateSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** POST {temp, measuredAt?}: add a reaction temperature reading (co-op units); answers with its check. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'batches:write');
  const batchId = idParam(id);
  const input = await parseBody(req, temperatureCreateSchema);
  return Response.json(await addTemperature(actor, batchId, input), { status: 201 });
});
