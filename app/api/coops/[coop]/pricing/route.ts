import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { createPolicy, listPolicies } from '@/lib/tank/pricing-policy';
import { pricingPolicyCreateSchema } from '@/lib/validation/tank';

export const dynamic = 'force-dynamic';

/** GET: the price in force and its history (any member: it is the price they pay). POST: a new policy (treasurer/admin). */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'tank:read');
  const policies = await listPolicies(actor);
  return { current: policies.find((p) => p.status === 'in-force') ?? null, policies, units: actor.coop.units };
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'pricing:write');
  const input = await parseBody(req, pricingPolicyCreateSchema);
  return Response.json(await createPolicy(actor, input), { status: 201 });
});
