import { requireMember } from '@/lib/auth';
import { listAuditEvents } from '@/lib/audit/events';
import { handler, parseQuery } from '@/lib/http';
import { auditQuerySchema } from '@/lib/validation/audit';

export const dynamic = 'force-dynamic';

/** GET: the co-op's audit log (admins), filtered by ?actor=&action=&from=&to=&page=. */
export const GET = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'audit:read');
  return listAuditEvents(actor, parseQuery(req, auditQuerySchema));
});
