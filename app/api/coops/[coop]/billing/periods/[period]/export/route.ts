import { requireMember } from '@/lib/auth';
import { buildCsv, csvResponse } from '@/lib/billing/export';
import { periodParam } from '@/lib/billing/params';
import { handler, parseQuery } from '@/lib/http';
import { exportQuerySchema } from '@/lib/validation/billing';

export const dynamic = 'force-dynamic';

/** GET ?kind=invoices|payments|balances: the month as CSV for the co-op's accountant. */
export const GET = handler<{ coop: string; period: string }>(async (req, { coop, period }) => {
  const actor = await requireMember(coop, 'billing:manage');
  const p = periodParam(period);
  const { kind } = parseQuery(req, exportQuerySchema);
  return csvResponse(
    await buildCsv(actor.coop.id, kind, p, actor.coop.timezone),
    `${actor.coop.slug}-${p}-${kind}.csv`,
  );
});
