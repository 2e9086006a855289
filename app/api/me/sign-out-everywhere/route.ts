import { signOutEverywhere } from '@/lib/account';
import { requireUser } from '@/lib/auth';
import { handler } from '@/lib/http';

export const dynamic = 'force-dynamic';

/** POST: end every session of mine on every device, this one included. */
export const POST = handler(async () => signOutEverywhere(await requireUser()));
