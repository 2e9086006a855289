import 'server-only';
import crypto from 'node:crypto';
import { z } from 'zod';
import { sequelize } from '@/lib/db';
import {
  DATABASE_RETRY_AFTER_SECONDS,
  isDatabaseUnavailable,
  noteDatabaseUnavailable,
  watchDatabase,
} from '@/lib/db-outage';
import { log } from '@/lib/log';
import { requestContext } from '@/lib/request-context';
import { COMMON_HEADERS, DOWNLOAD_CSP, HSTS } from '@/lib/security/headers';
import { isSameOriginRequest, servedOverHttps } from '@/lib/security/origin';
import { CONTROL_CHARS } from '@/lib/validation/common';
import { emptyFieldErrors, fieldErrors, type FieldErrors } from '@/lib/validation/fields';

watchDatabase(sequelize);

export type { FieldErrors };
export { emptyFieldErrors, fieldErrors };

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
/** 422 naming each field and what is wrong with it: the one answer to input that does not fit. */
export const invalidFields = (fields: Record<string, string[]>) =>
  new HttpError(422, 'Some fields need attention.', fields);
export const conflict = (why: string, extra?: Record<string, unknown>) => new HttpError(409, why, undefined, extra);

/** Parses a value with a schema or throws a 422 naming each field and reason. */
export function parseWith<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const r = schema.safeParse(value);
  if (!r.success) throw invalidFields(fieldErrors(r.error));
  return r.data;
}

/** The largest JSON body a route reads: far above any form's, far below what could hurt the server. */
export const MAX_JSON_BODY_BYTES = 256 * 1024;
/** How deeply a JSON body may nest; no form needs more than a few levels. */
const MAX_JSON_DEPTH = 32;

const isJsonType = (req: Request) => /^application\/json\s*(;|$)/i.test(req.headers.get('content-type') ?? '');

/**
 * Reads the body as UTF-8 text, stopping with a 413 as soon as it passes `limit` bytes (checked
 * from Content-Length first, then while the stream arrives, so a huge body is never held).
 */
async function readTextLimited(req: Request, limit: number): Promise<string> {
  const tooLarge = () => new HttpError(413, `The request body is larger than ${Math.round(limit / 1024)} kB.`);
  const declared = Number(req.headers.get('content-length') ?? 'NaN');
  if (Number.isFinite(declared) && declared > limit) throw tooLarge();
  if (!req.body) return '';
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel().catch(() => {});
      throw tooLarge();
    }
    chunks.push(value);
  }
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(Buffer.concat(chunks));
  } catch {
    throw new HttpError(400, 'The request body must be UTF-8 text.');
  }
}

/**
 * Keys named like Object.prototype's members (`__proto__`, `constructor`, `toString` …): no form
 * has such a field, and code that looks keys up in a plain object would find the prototype's
 * member instead. Refused anywhere in a body or query, whatever the schema would do with them.
 */
const PROTOTYPE_KEYS = new Set([...Object.getOwnPropertyNames(Object.prototype), 'prototype']);

/** A readable field name from a JSON path, with any control characters shown as "?". */
const fieldName = (path: (string | number)[]) =>
  (path.length ? path.join('.') : '_form').replace(/[\u0000-\u001f\u007f]/g, '?');

/**
 * Refuses text no person types (control characters other than tab and line breaks, including the
 * NUL that PostgreSQL text and jsonb can't hold) anywhere in a parsed body or query, and keys
 * named like Object.prototype's members, naming each field (422); and bodies nested deeper than
 * any form needs.
 */
export function checkHostileText(value: unknown): void {
  const fields = emptyFieldErrors();
  let tooDeep = false;
  const walk = (v: unknown, path: (string | number)[]) => {
    if (typeof v === 'string') {
      if (CONTROL_CHARS.test(v)) (fields[fieldName(path)] ??= []).push('Remove the control characters from this text.');
      return;
    }
    if (v === null || typeof v !== 'object') return;
    if (path.length >= MAX_JSON_DEPTH) {
      tooDeep = true;
      return;
    }
    if (Array.isArray(v)) v.forEach((item, i) => walk(item, [...path, i]));
    else
      for (const [k, item] of Object.entries(v)) {
        if (CONTROL_CHARS.test(k) || PROTOTYPE_KEYS.has(k))
          (fields[fieldName([...path, k])] ??= []).push('This field is not accepted here.');
        walk(item, [...path, k]);
      }
  };
  walk(value, []);
  if (tooDeep) throw new HttpError(422, 'The request body is nested too deeply.');
  if (Object.keys(fields).length) throw invalidFields(fields);
}

/**
 * Reads a JSON body without judging it yet: the returned function gives the value, or throws
 * the 415 (not declared as application/json), 413 (over MAX_JSON_BODY_BYTES), 400 (not JSON) or
 * 422 (control characters) — so a route can answer the session check first.
 */
async function readJson(req: Request): Promise<() => unknown> {
  try {
    if (!isJsonType(req)) throw new HttpError(415, 'Send the request body as application/json.');
    const text = await readTextLimited(req, MAX_JSON_BODY_BYTES);
    let value: unknown;
    try {
      value = JSON.parse(text);
    } catch {
      throw new HttpError(400, 'The request body must be JSON.');
    }
    checkHostileText(value);
    return () => value;
  } catch (e) {
    return () => {
      throw e;
    };
  }
}

/**
 * The request's JSON body, read on the first call only, so a route can answer the session check
 * before reading anything; the call throws the 415/413/400/422 of an unacceptable body.
 */
export function lazyJsonBody(req: Request): () => Promise<unknown> {
  let read: Promise<() => unknown> | null = null;
  return async () => (await (read ??= readJson(req)))();
}

/** Reads a JSON body (415/413/400 when it is not acceptable JSON) and validates it (422 with fields). */
export async function parseBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  return parseWith(schema, (await readJson(req))());
}

/** Validates the query string with a schema (422 with fields). */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  const params: Record<string, string> = Object.create(null);
  for (const [k, v] of new URL(req.url).searchParams) params[k] = v;
  checkHostileText(params);
  return parseWith(schema, params);
}

type Ctx<P> = { params: Promise<P> };

const READ_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
/** Routes whose callers are other servers, proving themselves another way (the payments webhook signs its body). */
const ORIGIN_EXEMPT_PATHS = new Set(['/api/payments/webhook']);
/** Body types a route may receive: JSON, and multipart for uploads (each route then insists on its own). */
const BODY_TYPES = /^(application\/json|multipart\/form-data)\s*(;|$)/i;

/**
 * The checks every state-changing request passes before the route runs: it comes from the app's
 * own origin (403 otherwise: another site's form or script must not act with the visitor's
 * cookie), and any body it carries is JSON or a multipart upload (415 otherwise: a text/plain or
 * form-encoded body is what a cross-site form can send without asking).
 */
function checkWriteRequest(req: Request): void {
  if (ORIGIN_EXEMPT_PATHS.has(new URL(req.url).pathname)) return;
  // A bearer caller is an integration, not a browser: no cookie acts for it (lib/auth/session.ts),
  // so another site cannot borrow its credentials, and the origin check does not apply.
  const bearer = /^Bearer\s/i.test(req.headers.get('authorization') ?? '');
  if (!bearer && !isSameOriginRequest(req))
    throw new HttpError(403, "This request did not come from Tallyvat's own pages.");
  // A body without a type is refused by parseBody and readUpload when the route reads one.
  const type = req.headers.get('content-type');
  if (type !== null && !BODY_TYPES.test(type)) {
    throw new HttpError(415, 'Send the request body as application/json.');
  }
}

/** Headers every answer from a route handler carries (the pages get theirs from proxy.ts). */
function withSecurityHeaders(res: Response, req: Request): Response {
  try {
    for (const [k, v] of Object.entries(COMMON_HEADERS)) if (!res.headers.has(k)) res.headers.set(k, v);
    if (!res.headers.has('content-security-policy')) res.headers.set('content-security-policy', DOWNLOAD_CSP);
    if (servedOverHttps(req.url)) res.headers.set('strict-transport-security', HSTS);
  } catch {
    // A response with immutable headers (one passed through from fetch) keeps its own.
  }
  return res;
}

/**
 * Wraps a route handler: writes (anything but GET/HEAD/OPTIONS) must come from the app's own
 * origin (403) with a JSON or multipart body (415); the body returns data (sent as JSON) or a
 * Response; HttpErrors become their status with { error, fields }; an unreachable database is a
 * 503 with { error, retryAfter }; anything else is logged with a request id and answered with a
 * 500 that reveals nothing. Every request is logged as one JSON line (request id, co-op slug,
 * method, route, status, duration), and answers carry the id in `X-Request-Id`.
 */
export function handler<P = Record<string, string>>(fn: (req: Request, params: P) => Promise<unknown>) {
  return async (req: Request, ctx: Ctx<P>): Promise<Response> => {
    const started = performance.now();
    const requestId = crypto.randomUUID();
    let coop: string | undefined;
    let res: Response;
    try {
      if (!READ_METHODS.has(req.method)) checkWriteRequest(req);
      const params = (await ctx?.params) ?? ({} as P);
      coop = (params as { coop?: unknown }).coop as string | undefined;
      const out = await requestContext.run({ method: req.method }, () => fn(req, params));
      res = withSecurityHeaders(out instanceof Response ? out : Response.json(out ?? { ok: true }), req);
    } catch (e) {
      res = withSecurityHeaders(errorResponse(e, requestId), req);
    }
    logRequest(req, res, { requestId, coop, durationMs: performance.now() - started });
    return res;
  };
}

/**
 * The access-log line of one API request, at info: failures are logged where they are understood
 * (an unexpected error once with its request id, an unreachable database once per outage).
 */
function logRequest(
  req: Request,
  res: Response,
  o: { requestId: string; coop: string | undefined; durationMs: number },
) {
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
  tanks_reserved_within_on_hand:
    'The tank no longer holds enough fuel for that; the figures changed while you were working. Reload and try again.',
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
      {
        error: "We can't reach the database right now. Nothing was changed; please try again in a few seconds.",
        code: 'database-unavailable',
        retryAfter: DATABASE_RETRY_AFTER_SECONDS,
      },
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
      return Response.json(
        { error: reason ?? "That change breaks one of the co-op's rules and was not made.", code: 'check', constraint },
        { status: 409 },
      );
    case code === '23503':
      return Response.json(
        {
          error: reason ?? 'That refers to something that does not exist or is still in use.',
          code: 'reference',
          constraint,
        },
        { status: 409 },
      );
    case code === '23502':
      return Response.json({ error: 'A required value is missing.', code: 'required' }, { status: 422 });
    case code.startsWith('22'):
      return Response.json(
        { error: 'A value is not one the database can store (too long, out of range or malformed).', code: 'value' },
        { status: 422 },
      );
    case code === '40001' || code === '40P01' || code === '55P03':
      return Response.json(
        { error: 'The co-op was busy with the same records; please try again.', code: 'busy', retryAfter: 1 },
        { status: 503, headers: { 'Retry-After': '1' } },
      );
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
    return Response.json(
      { error: e.message, ...(e.fields ? { fields: e.fields } : {}), ...(e.extra ?? {}) },
      { status: e.status },
    );
  }
  const mapped = databaseErrorResponse(e);
  if (mapped) return mapped;
  log.error({ requestId, err: e }, 'unexpected error');
  return Response.json({ error: 'Something went wrong on our side.', requestId }, { status: 500 });
}
