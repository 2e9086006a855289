import 'server-only';
import { cache } from 'react';
import { queryRows, queryRowSets, runReadPlan, statement, type ReadPlan } from '@/lib/db';
import { forbidden, HttpError, notFound, unauthorized } from '@/lib/http';
import type { Role } from '@/lib/auth/roles';
import type { UnitSystem, CoopSettings } from '@/models/Coop';
import { readSessionCookie, type SessionClaims } from './jwt';
import { can, type Action } from './policies';

export interface SessionUser {
  id: number;
  email: string;
  name: string;
}

/** The acting member: who, in which co-op, with which role. Passed first to every lib/ service. */
export interface Actor {
  user: SessionUser;
  coop: { id: number; slug: string; name: string; units: UnitSystem; currency: string; timezone: string; settings: CoopSettings };
  role: Role;
  membershipId: number;
}

/**
 * The signed-in user, re-read from the database on every request: a JWT whose session
 * version no longer matches (password changed, signed out everywhere) counts as signed out.
 */
const readSession = cache(readSessionCookie);

const SESSION_USER = statement('SELECT id, email, name, session_version FROM users WHERE id = $1', 'tv_session_user');

export const getSessionUser = cache(async (): Promise<SessionUser | null> => {
  const session = await readSession();
  if (!session) return null;
  const rows = await queryRows<{ id: number; email: string; name: string; session_version: number }>(SESSION_USER, [session.uid]);
  const u = rows[0];
  if (!u || session.sv !== u.session_version) return null;
  return { id: u.id, email: u.email, name: u.name };
});

/** The signed-in user or a 401. */
export async function requireUser(): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) throw unauthorized();
  return user;
}

const MY_COOPS = statement(
  `SELECT c.slug, c.name, m.role, m.status FROM memberships m JOIN coops c ON c.id = m.coop_id
   WHERE m.user_id = $1 ORDER BY c.name`,
  'tv_my_coops',
);

/** Memberships of a user, active and suspended, for the co-op switcher (on every page) and profile. */
export const listMyCoops = cache(async (userId: number) =>
  queryRows<{ slug: string; name: string; role: Role; status: string }>(MY_COOPS, [userId]),
);

/** The user and their membership in the co-op of the URL, in one query (null membership fields when not a member). */
const ACTOR = statement(
  `SELECT u.id AS user_id, u.email, u.name AS user_name, u.session_version,
          m.id AS membership_id, m.role, m.status, c.id AS coop_id, c.slug, c.name, c.units, c.currency, c.timezone, c.settings
     FROM users u
     LEFT JOIN (memberships m JOIN coops c ON c.id = m.coop_id AND c.slug = $2) ON m.user_id = u.id
    WHERE u.id = $1`,
  'tv_session_actor',
);

type ActorRow = {
  user_id: number; email: string; user_name: string; session_version: number;
  membership_id: number | null; role: Role; status: string; coop_id: number; slug: string; name: string;
  units: UnitSystem; currency: string; timezone: string; settings: CoopSettings;
};

const loadActor = cache(async (userId: number, coopSlug: string) => (await queryRows<ActorRow>(ACTOR, [userId, coopSlug]))[0]);

/** The actor of a fresh ACTOR row: 401 when the session is stale, 404 when not a member, 403 when suspended. */
function actorOf(row: ActorRow | undefined, session: SessionClaims): Actor {
  if (!row || row.session_version !== session.sv) throw unauthorized();
  if (row.membership_id === null) throw notFound('Co-op not found.');
  if (row.status !== 'active') throw forbidden('Your membership in this co-op is suspended.');
  return {
    user: { id: row.user_id, email: row.email, name: row.user_name },
    role: row.role,
    membershipId: row.membership_id,
    coop: { id: row.coop_id, slug: row.slug, name: row.name, units: row.units, currency: row.currency, timezone: row.timezone, settings: row.settings ?? {} },
  };
}

/**
 * The actor each user last had in each co-op in this process: the guess {@link requireMemberAnd}
 * builds its reads from. Never trusted on its own: every request reads the fresh row.
 */
const lastActors = new Map<string, { actor: Actor; json: string }>();
const LAST_ACTORS_MAX = 10_000;

/** The session's claims (401 without one), the co-op slug as looked up, and the key of the remembered actor. */
async function sessionFor(coopSlug: string): Promise<{ session: SessionClaims; slug: string; key: string }> {
  const session = await readSession();
  if (!session) throw unauthorized();
  const slug = String(coopSlug).slice(0, 60);
  return { session, slug, key: `${session.uid}/${slug}` };
}

function remember(key: string, actor: Actor): void {
  if (lastActors.size >= LAST_ACTORS_MAX) lastActors.clear();
  lastActors.set(key, { actor, json: JSON.stringify(actor) });
}

/** The actor of the fresh row, or the error it earns (forgetting the guess then). */
function checkedActor(key: string, row: ActorRow | undefined, session: SessionClaims, action: Action): Actor {
  let actor: Actor;
  try {
    actor = actorOf(row, session);
  } catch (e) {
    lastActors.delete(key);
    throw e;
  }
  if (!can(actor.role, action)) throw forbidden();
  return actor;
}

/**
 * The one authorization entry point: session → membership in the co-op of the URL → may this
 * role do this action. 401 without a session; 404 when the user is not in that co-op (its
 * existence is not revealed); 403 when suspended or the role may not.
 */
export async function requireMember(coopSlug: string, action: Action): Promise<Actor> {
  const { session, slug, key } = await sessionFor(coopSlug);
  const actor = checkedActor(key, await loadActor(session.uid, slug), session, action);
  remember(key, actor);
  return actor;
}

/**
 * {@link requireMember} and a read-only plan in one round trip, for the busiest read routes.
 * The plan's statements are built from the actor this user last had in this co-op and sent in
 * the same message as the session check. The fresh row is checked first (401/403/404 exactly as
 * requireMember), and the rows are used only when the fresh actor is the same as the guess;
 * otherwise they are discarded and the plan is read again for the fresh actor. Without a guess
 * (or when building the plan from it fails) it is requireMember, then the plan. So a demotion,
 * suspension or sign-out everywhere still counts from the very next request.
 */
export async function requireMemberAnd<R>(
  coopSlug: string,
  action: Action,
  build: (actor: Actor) => ReadPlan<R> | Promise<ReadPlan<R>>,
): Promise<{ actor: Actor; result: R }> {
  const { session, slug, key } = await sessionFor(coopSlug);
  const guess = lastActors.get(key);
  let plan: ReadPlan<R> | null = null;
  try {
    plan = guess ? await build(guess.actor) : null;
  } catch {
    plan = null; // e.g. a query string that does not validate: answered after the session check, below
  }
  if (guess && plan) {
    const [actorRows, ...rowSets] = await queryRowSets<unknown[][]>([[ACTOR, [session.uid, slug]], ...plan.reads]);
    const actor = checkedActor(key, actorRows![0] as ActorRow | undefined, session, action);
    if (JSON.stringify(actor) === guess.json) return { actor, result: await plan.finish(rowSets) };
    remember(key, actor);
    return { actor, result: await runReadPlan(await build(actor)) };
  }
  const actor = await requireMember(coopSlug, action);
  return { actor, result: await runReadPlan(await build(actor)) };
}

/** For pages: the actor or null instead of throwing on 401/403/404. */
export async function findActor(coopSlug: string, action: Action = 'coop:read'): Promise<Actor | HttpError> {
  try {
    return await requireMember(coopSlug, action);
  } catch (e) {
    if (e instanceof HttpError) return e;
    throw e;
  }
}
