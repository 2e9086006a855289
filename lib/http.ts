import 'server-only';
import crypto from 'node:crypto';
import { z } from 'zod';

/** Field → reasons, as returned to forms (`fields.email = ['Enter a valid e-mail address']`). */
export type FieldErrors = Record<string, string[]>;

/** An error with an HTTP status that route handlers turn into a JSON answer. */
export class HttpError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly fields?: FieldErrors,
    public readonly extra?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export const unauthorized = () => new HttpError(401, 'Sign in to continue.');
export const forbidden = (why = 'Your role in this co-op does not allow this.') => new HttpError(403, why);
export const notFound = (what = 'Not found.') => new HttpError(404, what);
export const conflict = (why: string, extra?: Record<string, unknown>) => new HttpError(409, why, undefined, extra);

/** Flattens zod issues into { "a.b": ["reason"] }. */
export function fieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    // A key the schema does not accept (a smuggled coopId, role …) is reported under its own name.
    if (issue.code === 'unrecognized_keys') {
      for (const k of issue.keys) (out[[...issue.path, k].join('.')] ??= []).push('This field is not accepted here.');
      continue;
    }
    const key = issue.path.length ? issue.path.join('.') : '_form';
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Parses a value with a schema or throws a 422 naming each field and reason. */
export function parseWith<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const r = schema.safeParse(value);
  if (!r.success) throw new HttpError(422, 'Some fields need attention.', fieldErrors(r.error));
  return r.data;
}

/**
 * Reads a JSON body without judging it yet: the returned function gives the value, or throws the
 * 400 when the body is not JSON (so a route can answer the session check first).
 */
async function readJson(req: Request): Promise<() => unknown> {
  try {
    const value: unknown = await req.json();
    return () => value;
  } catch {
    return () => {
      throw new HttpError(400, 'The request body must be JSON.');
    };
  }
}

/**
 * The request's JSON body, read on the first call only, so a route can answer the session check
 * before reading anything; the call throws the 400 when the body is not JSON.
 */
export function lazyJsonBody(req: Request): () => Promise<unknown> {
  let read: Promise<() => unknown> | null = null;
  return async () => (await (read ??= readJson(req)))();
}

/** Reads a JSON body (400 when it is not JSON) and validates it (422 with fields). */
export async function parseBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  return parseWith(schema, (await readJson(req))());
}

/** Validates the query string with a schema (422 with fields). */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(req.url).searchParams.entries());
  return parseWith(schema, params);
}

type Ctx<P> = { params: Promise<P> };

/**
 * Wraps a route handler: the body returns data (sent as JSON) or a Response; HttpErrors become
 * their status with { error, fields }; anything else is logged with a request id and answered
 * with a 500 that reveals nothing.
 */
export function handler<P = Record<string, string>>(fn: (req: Request, params: P) => Promise<unknown>) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    try {
      const params = (await ctx?.params) ?? ({} as P);
      const out = await fn(req, params);
      if (out instanceof Response) return out;
      return Response.json(out ?? { ok: true });
    } catch (e) {
      return errorResponse(e);
    }
  };
}

/** SQLSTATE raised by the database's lock triggers (e.g. a closed billing month). */
const LOCKED_SQLSTATE = 'TV409';

export function errorResponse(e: unknown): Response {
  const db = (e as { original?: { code?: string; message?: string } } | null)?.original;
  if (db?.code === LOCKED_SQLSTATE) return Response.json({ error: db.message, code: 'locked' }, { status: 409 });
  if (e instanceof HttpError) {
    return Response.json({ error: e.message, ...(e.fields ? { fields: e.fields } : {}), ...(e.extra ?? {}) }, { status: e.status });
  }
  const requestId = crypto.randomUUID();
  console.error(`[request ${requestId}]`, e);
  return Response.json({ error: 'Something went wrong on our side.', requestId }, { status: 500 });
}
