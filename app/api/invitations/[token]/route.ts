import { getSessionUser } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { acceptInvitation, invitationError, lookupInvitation } from '@/lib/members/invitations';
import { invitationAcceptSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

// Public: the token in the URL is the credential. Unknown link → 404; used, withdrawn or
// expired → 410 with `reason`.

/** GET: the co-op, role and invited address behind a link, and whether the visitor must create an account or sign in. */
export const GET = handler<{ token: string }>(async (_req, { token }) => {
  const lookup = await lookupInvitation(token, await getSessionUser());
  if (lookup.state !== 'ok') throw invitationError(lookup);
  return lookup.info;
});

/** POST {name, password} for a new account, {} when signed in as the invited address: join the co-op. */
export const POST = handler<{ token: string }>(async (req, { token }) => {
  const user = await getSessionUser();
  const input = await parseBody(req, invitationAcceptSchema);
  return Response.json(await acceptInvitation(token, user, input), { status: 201 });
});
