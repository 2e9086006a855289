import { requireMember } from '@/lib/auth';
import { getInvoiceDetail } from '@/lib/billing/invoices';
import { sendInvoiceEmail } from '@/lib/billing/mail';
import { idParam } from '@/lib/validation/id-param';
import { handler, parseBody } from '@/lib/http';
import { invoicesIssueSchema } from '@/lib/validation/billing';
import { audit } from '@/lib/audit';

export const dynamic = 'force-dynamic';

/** POST {}: e-mail an issued invoice or credit note to its member again, now. */
export const POST = handler<{ coop: string; id: string }>(async (req, { coop, id }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const invoiceId = idParam(id);
  await parseBody(req, invoicesIssueSchema);
  const inv = await getInvoiceDetail(actor.coop.id, invoiceId, { includeDrafts: false });
  const emailStatus = await sendInvoiceEmail(actor.coop.id, inv.id);
  await audit({ coopId: actor.coop.id, actorUserId: actor.user.id, action: 'invoice.email', entityType: 'invoice', entityId: inv.id, before: { emailStatus: inv.emailStatus }, after: { emailStatus } });
  return { emailStatus };
});
