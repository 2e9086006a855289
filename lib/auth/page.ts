import 'server-only';
import { forbidden, notFound, redirect } from 'next/navigation';
import { HttpError } from '@/lib/http';
import type { Action } from './policies';
import { requireMember, type Actor } from './session';

/**
 * The one way a page asks who may see it: `requireMember`, with its answers turned into the
 * framework's own page outcomes — no session → the sign-in page (coming back to `nextPath`);
 * not a member of this co-op → the not-found page (its existence is not revealed); suspended or
 * a role that may not → `forbidden()`, which renders `app/c/[coop]/forbidden.tsx` with status 403
 * inside the co-op's navigation.
 */
export async function requirePageActor(coopSlug: string, action: Action, nextPath = `/c/${coopSlug}`): Promise<Actor> {
  try {
    return await requireMember(coopSlug, action);
  } catch (e) {
    if (!(e instanceof HttpError)) throw e;
    if (e.status === 401) redirect(`/sign-in?next=${encodeURIComponent(nextPath)}`);
    if (e.status === 404) notFound();
    forbidden();
  }
}
