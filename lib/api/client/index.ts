import createClient from 'openapi-fetch';
import type { paths } from './types';

// The typed client for the front end, generated from the OpenAPI document (types.ts, by
// `npm run api:types`): paths, parameters, bodies and answers are checked at compile time, so a
// renamed field is a type error in the component that uses it.

export type { paths };

/** Same-origin client: the browser sends the session cookie and its own Origin. */
export const apiClient = createClient<paths>({ baseUrl: '' });

/** Field errors and message of a failed call, in the shape the forms show. */
export function apiError(error: unknown, status: number): { error: string; fields: Record<string, string[]> } {
  const e = (error ?? {}) as { error?: unknown; fields?: unknown };
  return {
    error: typeof e.error === 'string' ? e.error : `Request failed (${status}).`,
    fields: e.fields && typeof e.fields === 'object' ? (e.fields as Record<string, string[]>) : {},
  };
}
