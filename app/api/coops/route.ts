import { requireUser, listMyCoops } from '@/lib/auth';
import { createCoop } from '@/lib/coops';
import { handler, parseBody } from '@/lib/http';
import { coopCreateSchema } from '@/lib/validation/auth';

export const dynamic = 'force-dynamic';

/** GET: the signed-in user's co-ops. POST: create a co-op; its creator becomes admin. */
export const GET = handler(async () => {
  const user = await requireUser();
  return { coops: await listMyCoops(user.id) };
});

export const POST = handler(async (req) => {
  const user = await requireUser();
  const input = await parseBody(req, coopCreateSchema);
  return Response.json(await createCoop(user, input), { status: 201 });
});
