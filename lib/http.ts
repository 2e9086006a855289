import 'server-only';
import crypto from 'node:crypto';
import { z } from 'zod';
import { sequelize } from '@/lib/db';
import { DATABASE_RETRY_AFTER_SECONDS, isDatabaseUnavailable, noteDatabaseUnavailable, watchDatabase } from '@/lib/db-outage';
import { log } from '@/lib/log';

watchDatabase(sequelize);

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
 * their status with { error, fields }; an unreachable database is a 503 with { error, retryAfter };
 * anything else is logged with a request id and answered with a 500 that reveals nothing. Every
 * request is logged as one JSON line (request id, co-op slug, method, route, status, duration),
 * and answers carry the id in `X-Request-Id` so a person can quote it.
 */
export function handler<P = Record<string, string>>(fn: (req: Request, params: P) => Promise<unknown>) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    const started = performance.now();
    const requestId = crypto.randomUUID();
    let coop: string | undefined;
    let res: Response;
    try {
      const params = (await ctx?.params) ?? ({} as P);
      coop = (params as { coop?: unknown }).coop as string | undefined;
      const out = await fn(req, params);
      res = out instanceof Response ? out : Response.json(out ?? { ok: true });
    } catch (e) {
      res = errorResponse(e, requestId);
    }
    logRequest(req, res, { requestId, coop, durationMs: performance.now() - started });
    return res;
  };
}

/**
 * The access-log line of one API request, at info: failures are logged where they are understood
 * (an unexpected error once with its request id, an unreachable database once per outage).
 */
function logRequest(req: Request, res: Response, o: { requestId: string; coop: string | undefined; durationMs: number }) {
  try {
    res.headers.set('X-Request-Id', o.requestId);
  } catch {
    /* a Response with immutable headers (e.g. proxied from fetch) keeps its own */
  }
  const line = {
    requestId: o.requestId,
    coop: o.coop,
    method: req.method,
    route: new URL(req.url).pathname,
    status: res.status,
    durationMs: Math.round(o.durationMs * 10) / 10,
  };
  log.info(line, 'request');
}

/** SQLSTATE raised by the database's lock triggers (e.g. a closed billing month). */
const LOCKED_SQLSTATE = 'TV409';

/**
 * Readable reasons for the database's named constraints, where the constraint's name alone would
 * mean nothing to a person. Unlisted constraints get the generic wording of their kind.
 */
const CONSTRAINT_REASONS: Record<string, string> = {
  tanks_reserved_within_on_hand: 'The tank no longer holds enough fuel for that; the figures changed while you were working. Reload and try again.',
  tanks_on_hand_nonnegative: 'That would take the tank below empty.',
};

/**
 * The one mapping from database errors to answers a person understands, wherever they are
 * raised: the closed-month trigger and unique, check and foreign-key violations are 409;
 * values the column can't hold (bad number, out of range, too long) are 422; a deadlock or
 * serialization failure that outlived the transaction helper's retries is 503 (try again), and so
 * is a database that can't be reached (refused, timed out, shutting down, connection cut) — with
 * `retryAfter` seconds in the body and a Retry-After header. Returns null for anything else.
 */
export function databaseErrorResponse(e: unknown): Response | null {
  if (isDatabaseUnavailable(e)) {
    noteDatabaseUnavailable(e);
    return Response.json(
      { error: 'We can\'t reach the database right now. Nothing was changed; please try again in a few seconds.', code: 'database-unavailable', retryAfter: DATABASE_RETRY_AFTER_SECONDS },
      { status: 503, headers: { 'Retry-After': String(DATABASE_RETRY_AFTER_SECONDS) } },
    );
  }
  const db = (e as { original?: { code?: string; message?: string; constraint?: string } } | null)?.original;
  const code = db?.code;
  if (!code) return null;
  const constraint = db.constraint ?? '';
  const reason = CONSTRAINT_REASONS[constraint];
  switch (true) {
    case code === LOCKED_SQLSTATE:
      return Response.json({ error: db.message, code: 'locked' }, { status: 409 });
    case code === '23505':
      return Response.json({ error: reason ?? 'That already exists.', code: 'duplicate', constraint }, { status: 409 });
    case code === '23514':
      return Response.json({ error: reason ?? 'That change breaks one of the co-op\'s rules and was not made.', code: 'check', constraint }, { status: 409 });
    case code === '23503':
      return Response.json({ error: reason ?? 'That refers to something that does not exist or is still in use.', code: 'reference', constraint }, { status: 409 });
    case code === '23502':
      return Response.json({ error: 'A required value is missing.', code: 'required' }, { status: 422 });
    case code.startsWith('22'):
      return Response.json({ error: 'A value is not one the database can store (too long, out of range or malformed).', code: 'value' }, { status: 422 });
    case code === '40001' || code === '40P01' || code === '55P03':
      return Response.json({ error: 'The co-op was busy with the same records; please try again.', code: 'busy', retryAfter: 1 }, { status: 503, headers: { 'Retry-After': '1' } });
    default:
      return null;
  }
}

/**
 * The answer for an error thrown by a route: HttpErrors as their status, database errors through
 * {@link databaseErrorResponse}, anything else a 500 whose `requestId` is the one in the log line
 * that records the error (logged here, once, with its stack).
 */
export function errorResponse(e: unknown, requestId: string = crypto.randomUUID()): Response {
  if (e instanceof HttpError) {
    return Response.json({ error: e.message, ...(e.fields ? { fields: e.fields } : {}), ...(e.extra ?? {}) }, { status: e.status });
  }
  const mapped = databaseErrorResponse(e);
  if (mapped) return mapped;
  log.error({ requestId, err: e }, 'unexpected error');
  return Response.json({ error: 'Something went wrong on our side.', requestId }, { status: 500 });
}
