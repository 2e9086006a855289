import { requireMember } from '@/lib/auth';
import { issueDrafts } from '@/lib/billing/issue';
import { periodParam } from '@/lib/billing/params';
import { handler, parseBody } from '@/lib/http';
import { invoicesIssueSchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** POST {}: issue every draft of the month (numbers assigned, e-mails queued). */
export const POST = handler<{ coop: string; period: string }>(async (req, { coop, period }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const p = periodParam(period);
  await parseBody(req, invoicesIssueSchema);
  return issueDrafts(actor, p);
});
