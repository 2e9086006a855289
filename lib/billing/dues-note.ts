import 'server-only';
import type { ActorCoop } from '@/lib/auth/actor';
import { formatDate, isoDay } from '@/lib/dates';
import { formatCents } from '@/lib/money';
import { Membership } from '@/models';
import { periodLabel } from './periods';
import type { InvoiceDetail } from './types';

/**
 * Why an invoice carries no dues line, in a sentence (null when it has one, or is not a monthly
 * invoice): the co-op charges none, the member joined after the month, or was not active. The run
 * charges dues to active members who joined before the month's end (lib/billing/run/queries.ts).
 */
export async function whyNoDues(
  coop: ActorCoop,
  inv: InvoiceDetail,
  audience: 'member' | 'treasurer',
): Promise<string | null> {
  if (inv.kind !== 'invoice' || inv.status === 'void' || inv.lines.some((l) => l.kind === 'dues')) return null;
  const dues = coop.settings.monthlyDuesCents ?? 0;
  if (!dues) return 'No membership dues: the co-op does not charge any (set in the co-op settings).';
  const m = await Membership.findOne({
    attributes: ['joinedAt', 'status'],
    where: { id: inv.memberId, coopId: coop.id },
    raw: true,
  });
  if (!m) return null;
  const who = audience === 'member' ? 'you' : inv.memberName;
  const month = periodLabel(inv.period);
  const joinedMonth = isoDay(new Date(m.joinedAt), coop.timezone).slice(0, 7);
  if (joinedMonth > inv.period) {
    return `No membership dues for ${month}: ${who} joined on ${formatDate(m.joinedAt, coop.timezone)}, after the month ended. Dues of ${formatCents(dues, coop.currency)} a month are charged from ${periodLabel(joinedMonth)}.`;
  }
  if (m.status !== 'active')
    return `No membership dues for ${month}: ${audience === 'member' ? 'your membership was' : `${inv.memberName}’s membership was`} not active when this invoice was prepared.`;
  return null;
}
