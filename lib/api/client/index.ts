import createClient from 'openapi-fetch';
import type { paths } from './types';

// The typed client for the front end, generated from the OpenAPI document (types.ts, by
// `npm run api:types`): paths, parameters, bodies and answers are checked at compile time, so a
// renamed field is a type error in the component that uses it.

export type { paths };

/** Same-origin client: the browser sends the session cookie and its own Origin. */
export const apiClient = createClient<paths>({ baseUrl: '' });

/** What an apiClient call resolves to: the declared answer, or an error body. */
export type ClientResult<T> = { data?: T; error?: unknown; response: Response };

/** For SWR fetchers: the declared answer, or a thrown Error carrying the status and the server's sentence. */
export async function dataOrThrow<T>(request: Promise<ClientResult<T>>): Promise<T> {
  const r = await request;
  if (!r.response.ok)
    throw Object.assign(new Error(apiError(r.error, r.response.status).error), { status: r.response.status });
  return r.data as T;
}

/** Field errors and message of a failed call, in the shape the forms show. */
export function apiError(error: unknown, status: number): { error: string; fields: Record<string, string[]> } {
  const e = (error ?? {}) as { error?: unknown; fields?: unknown };
  return {
    error: typeof e.error === 'string' ? e.error : `Request failed (${status}).`,
    fields: e.fields && typeof e.fields === 'object' ? (e.fields as Record<string, string[]>) : {},
  };
}
