import type { Role } from '../../support/api';

/**
 * One entry per exported method of every app/api route handler. The matrix test fails when a
 * route file exports a method that no entry lists, so a new route cannot be forgotten.
 *
 * - scope 'coop': path contains [coop]; expected: no session → 401; a member of another co-op
 *   → 404; roles not in `allow` → 403; roles in `allow` → passes authorization (any status
 *   other than 401/403, and other than 404 unless the path has an [id]-like segment).
 * - scope 'user': needs a session (401 without), any signed-in user passes.
 * - scope 'public': no session needed (not 401/403).
 */
export interface RouteSpec {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The route path as in the file tree, e.g. /api/coops/[coop]/members/[id] */
  path: string;
  scope: 'coop' | 'user' | 'public';
  allow?: readonly Role[];
  /** A body to send (usually an empty one: authorization must come before validation). */
  body?: unknown;
  /** Concrete values for dynamic segments other than [coop]; defaults to 999999999. */
  params?: Record<string, string>;
  note?: string;
}

export const ALL: readonly Role[] = ['admin', 'treasurer', 'brewer', 'member'];
export const BREWERS: readonly Role[] = ['admin', 'brewer'];
export const TREASURERS: readonly Role[] = ['admin', 'treasurer'];
export const ADMINS: readonly Role[] = ['admin'];
