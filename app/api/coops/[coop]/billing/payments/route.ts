import { requireMember } from '@/lib/auth';
import { recordPayment } from '@/lib/billing/payments';
import { listPayments } from '@/lib/billing/payments-read';
import { handler, parseBody, parseQuery } from '@/lib/http';
import { paymentListQuerySchema, paymentRecordSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** GET ?period=&unmatched=1&page=: payments received. POST: record cash or a cheque. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const q = parseQuery(req, paymentListQuerySchema);
  return listPayments(actor.coop.id, {
    period: q.period,
    unmatched: Boolean(q.unmatched),
    page: q.page,
    pageSize: q.pageSize,
  });
});

export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const input = await parseBody(req, paymentRecordSchema);
  return Response.json(await recordPayment(actor, { ...input, amountCents: input.amount }), { status: 201 });
});
