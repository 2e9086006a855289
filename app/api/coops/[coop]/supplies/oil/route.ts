import { requireMember } from '@/lib/auth';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { createOilLot, listOilLots } from '@/lib/supplies/oil-lots';
import { oilLotCreateSchema, oilLotListSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** GET: oil lots, one page, with litres used by batches. POST: record collected oil (volume in co-op units). */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'supplies:read');
  return listOilLots(actor, parseQuery(req, oilLotListSchema));
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'supplies:write');
  const input = await parseBody(req, oilLotCreateSchema);
  return Response.json(await createOilLot(actor, input), { status: 201 });
});
