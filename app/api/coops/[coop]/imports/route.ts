import { requireMember } from '@/lib/auth';
import { handler } from '@/lib/http';
import { listImports } from '@/lib/imports';

export const dynamic = 'force-dynamic';

/** GET: the co-op's imports, newest first (admins). */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'imports:manage');
  return { imports: await listImports(actor) };
});
