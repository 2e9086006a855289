import { requireMember } from '@/lib/auth';
import { queueInvoiceEmail } from '@/lib/billing/mail';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { invoicesIssueSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {}: e-mail an issued invoice or credit note to its member again: its mail job is queued (202). */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const invoiceId = idParam(id);
  await parseBody(req, invoicesIssueSchema);
  return Response.json(await queueInvoiceEmail(actor, invoiceId), { status: 202 });
});
