import { requireMember } from '@/lib/auth';
import { invoicePdfResponse } from '@/lib/billing/pdf';
import { handler } from '@/lib/http';
import { idParam } from '@/lib/validation/id-param';

export const dynamic = 'force-dynamic';

/** GET: the invoice (or draft, marked DRAFT) as a PDF download. */
export const GET = handler<{ coop: string; id: string }>(async (_req, { coop, id }) =>
  invoicePdfResponse(await requireMember(coop, 'billing:manage'), idParam(id), 'co-op'),
);
