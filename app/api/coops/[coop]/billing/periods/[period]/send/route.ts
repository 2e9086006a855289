import { requireMember } from '@/lib/auth';
import { resendMonthEmails } from '@/lib/billing/mail';
import { periodParam } from '@/lib/billing/params';
import { periodToDate } from '@/lib/billing/periods';
import { handler, parseBody } from '@/lib/http';
import { invoicesIssueSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {}: e-mail again every issued invoice of the month that was not sent or not delivered. */
export const POST = handler<{ coop: string; period: string }>(async (req, { coop, period }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const month = periodToDate(periodParam(period));
  await parseBody(req, invoicesIssueSchema);
  return Response.json({ queued: await resendMonthEmails(actor.coop.id, month) }, { status: 202 });
});
