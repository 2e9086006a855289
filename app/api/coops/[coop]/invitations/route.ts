import { requireMember } from '@/lib/auth';
import { handler, parseBody } from '@/lib/http';
import { createInvitation, listPendingInvitations } from '@/lib/members/invitations';
import { invitationCreateSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** GET: pending invitations (expired ones included). Admins only. */
export const GET = handler<{ coop: string }>(async (_req, { coop }) => {
  const actor = await requireMember(coop, 'members:manage');
  return { invitations: await listPendingInvitations(actor) };
});

/** POST {email, role}: invite by e-mail. 201 with `sent` false when the mail server could not take it (resend later). */
export const POST = handler<{ coop: string }>(async (req, { coop }) => {
  const actor = await requireMember(coop, 'members:manage');
  const input = await parseBody(req, invitationCreateSchema);
  return Response.json(await createInvitation(actor, input), { status: 201 });
});
