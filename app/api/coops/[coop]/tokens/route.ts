import { createApiToken, listApiTokens } from '@/lib/api-tokens';
import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { apiTokenCreateSchema } from '@/lib/validation/api-tokens';

export const dynamic = 'force-dynamic';

/** GET — the co-op's personal access tokens (admins, treasurers; from a session). */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => ({
  tokens: await listApiTokens(await requireMember(coop, 'tokens:manage')),
}));

/** POST {name, access} → 201 {token, secret}: the secret is shown this once. */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'tokens:manage');
  const input = await parseBody(req, apiTokenCreateSchema);
  return Response.json(await createApiToken(actor, input), { status: 201 });
});
