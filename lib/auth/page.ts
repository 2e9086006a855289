import 'server-only';
import { forbidden, notFound, redirect } from 'next/navigation';
import { cache } from 'react';
import { HttpError } from '@/lib/http';
import { can, type Action } from './policies';
import { findActor, type Actor } from './session';

/**
 * The signed-in person's membership in the co-op, read once per page request however many
 * layouts and the page ask (React's per-request `cache`): the co-op's layout, a section's guard
 * layout and the page share one session query. An HttpError (401/403/404) instead of throwing.
 */
export const pageMember = cache((coopSlug: string): Promise<Actor | HttpError> => findActor(coopSlug, 'coop:read'));

/**
 * The one way a page asks who may see it, with the answers turned into the framework's own page
 * outcomes — no session → the sign-in page (coming back to `nextPath`); not a member of this
 * co-op → the not-found page (its existence is not revealed); suspended or a role that may not →
 * `forbidden()`, which renders `app/c/[coop]/forbidden.tsx` inside the co-op's navigation. A
 * section whose pages some roles may not see calls it from its own `layout.tsx` too: a layout sits
 * outside its segment's `loading.tsx`, so the refusal is decided before anything streams and
 * the answer's status is 403 (a page's own call is behind the loading boundary).
 */
export async function requirePageActor(coopSlug: string, action: Action, nextPath = `/c/${coopSlug}`): Promise<Actor> {
  const actor = await pageMember(coopSlug);
  if (actor instanceof HttpError) {
    if (actor.status === 401) redirect(`/sign-in?next=${encodeURIComponent(nextPath)}`);
    if (actor.status === 404) notFound();
    forbidden();
  }
  if (!can(actor.role, action)) forbidden();
  return actor;
}

/** A section's guard layout: renders its pages only for roles that may `action` (403 otherwise). */
export function sectionGuard(action: Action) {
  return async function SectionLayout({
    children,
    params,
  }: {
    children: React.ReactNode;
    params: Promise<{ coop: string }>;
  }) {
    const { coop } = await params;
    await requirePageActor(coop, action, `/c/${coop}`);
    return children;
  };
}
