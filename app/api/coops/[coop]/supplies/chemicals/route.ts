import { requireMember } from '@/lib/auth';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { createChemicalLot, listChemicalLots } from '@/lib/supplies/chemical-lots';
import { chemicalLotCreateSchema, chemicalLotListSchema } from '@/lib/validation/brewing';

export const dynamic = 'force-dynamic';

/** GET: chemical lots, one page (?page, pageSize, sort, dir, kind). POST: record a purchase. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'supplies:read');
  return listChemicalLots(actor, parseQuery(req, chemicalLotListSchema));
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'supplies:write');
  const input = await parseBody(req, chemicalLotCreateSchema);
  return Response.json(await createChemicalLot(actor, input), { status: 201 });
});
