import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { createTank, listTanks } from '@/lib/tank';
import { tankCreateSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/** GET: the co-op's tanks with on hand / reserved / available (any member). POST: a new tank (brewer/admin). */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'tank:read');
  return { tanks: await listTanks(actor), units: actor.coop.units };
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'tank:write');
  const input = await parseBody(req, tankCreateSchema);
  return Response.json(await createTank(actor, input), { status: 201 });
});
