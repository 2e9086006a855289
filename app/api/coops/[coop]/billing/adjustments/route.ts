import { requireMember } from '@/lib/auth';
import { createAdjustment, listAdjustments } from '@/lib/billing/adjustments';
import { handler, parseBody } from '@/lib/http';
import { adjustmentCreateSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** GET: adjustments not billed yet. POST {memberId, amount, description, period?}: a charge or credit for the next invoice. */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'billing:manage');
  return { adjustments: await listAdjustments(actor.coop.id, { pendingOnly: true }) };
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const input = await parseBody(req, adjustmentCreateSchema);
  return Response.json(
    await createAdjustment(actor, {
      memberId: input.memberId,
      amountCents: input.amount,
      description: input.description,
      period: input.period,
    }),
    { status: 201 },
  );
});
