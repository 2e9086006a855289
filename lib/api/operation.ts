import { z } from 'zod';
import { POLICY, type Action } from '@/lib/auth/policies';
import type { Role } from '@/lib/auth/roles';
import { errorSchema } from './schemas';

// One declaration per route handler method: the contract the OpenAPI document, the reference
// page, the typed client and the response checks in tests/support are all built from. Route
// files (app/**/route.ts) may export only handlers and route config, so declarations live here,
// one file per domain under lib/api/operations/, reusing the zod schemas of lib/validation.

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/**
 * Who may call an operation:
 * - `{ action }`: a member of the co-op in the URL whose role the policy allows
 *   (lib/auth/policies.ts); a session cookie or a personal access token for that co-op;
 * - `'user'`: any signed-in person (session cookie only: tokens belong to one co-op);
 * - `'public'`: anyone (the link's token or a signature is the proof where one is needed).
 */
export type Access = { action: Action; roles?: readonly Role[]; note?: string } | 'user' | 'public';

/** A non-JSON answer: a download. */
export type FileBody = { file: string; description?: string };

/** A multipart/form-data upload: its fields, the file ones declared with `uploadedFile()` (lib/api/dto/common). */
export type MultipartBody = { multipart: z.ZodObject };

export const isMultipart = (b: unknown): b is MultipartBody =>
  b !== null && typeof b === 'object' && 'multipart' in b && !(b instanceof z.ZodType);

/** A JSON body's schema, a download, no body (null), or alternatives by media type. */
export type ResponseBody = z.ZodType | FileBody | null | readonly (z.ZodType | FileBody)[];

export const isFileBody = (b: unknown): b is FileBody =>
  b !== null && typeof b === 'object' && 'file' in b && !(b instanceof z.ZodType);

export interface OperationSpec {
  method: Method;
  /** As in the file tree: /api/coops/[coop]/tanks/[tankId] */
  path: string;
  summary: string;
  description?: string;
  access: Access;
  /** Path parameters other than [coop] (added by itself); undeclared ones are whole ids. */
  params?: z.ZodObject;
  query?: z.ZodObject;
  /** A JSON body schema, or the fields of a multipart/form-data upload. */
  body?: z.ZodType | MultipartBody;
  /** Success answers by status; error answers are added from what the route can refuse. */
  responses: Record<number, ResponseBody>;
  /** Error statuses beyond the standard ones (e.g. 409, 402, 410, 429), with what they mean. */
  errors?: Record<number, string>;
  tags?: string[];
}

export interface Operation extends OperationSpec {
  /** Roles allowed (from the policy, or the access override); empty for user/public routes. */
  roles: readonly Role[];
  /** Every status the route may answer, success and error. */
  statuses: Record<number, ResponseBody>;
  errorDescriptions: Record<number, string>;
  /** Changes something: refused for a read-only token. */
  write: boolean;
}

const STANDARD_ERRORS: Record<number, string> = {
  400: 'Malformed request (the body is not JSON or not UTF-8).',
  401: 'Not signed in, or the access token is missing, unknown or revoked.',
  403: 'The role (or a read-only token) may not do this, the membership is suspended, or a write came from another origin.',
  404: 'Not found, or not a member of this co-op (its existence is not revealed).',
  409: 'Conflicts with the current state (a closed month, a duplicate, a rule of the co-op).',
  413: 'The request body is too large.',
  415: 'The body is not application/json (or multipart/form-data for uploads).',
  422: 'Some fields need attention: `fields` names each with its reasons.',
  429: 'Too many attempts; wait for Retry-After seconds.',
  500: 'Something went wrong on our side; quote `requestId`.',
  503: 'The database is unreachable or busy; try again after Retry-After seconds.',
};

/** Turns a declaration into an operation with its roles and every status it may answer. */
export function operation(spec: OperationSpec): Operation {
  const write = spec.method !== 'GET';
  const errs = new Set<number>([500, 503, ...Object.keys(spec.errors ?? {}).map(Number)]);
  if (spec.access !== 'public') errs.add(401);
  if (typeof spec.access === 'object') [403, 404].forEach((s) => errs.add(s));
  if (/\[(?!coop\])[^\]]+\]/.test(spec.path)) errs.add(404);
  if (spec.query || spec.body) errs.add(422);
  if (write) [400, 403, 409, 413, 415, 422].forEach((s) => errs.add(s));
  const statuses: Record<number, ResponseBody> = { ...spec.responses };
  const errorDescriptions: Record<number, string> = {};
  for (const s of [...errs].sort()) {
    if (s in statuses) continue;
    statuses[s] = errorSchema;
    errorDescriptions[s] = spec.errors?.[s] ?? STANDARD_ERRORS[s] ?? 'Refused.';
  }
  const roles = typeof spec.access === 'object' ? (spec.access.roles ?? POLICY[spec.access.action]) : [];
  return { ...spec, roles, statuses, errorDescriptions, write };
}

/** The OpenAPI path of a file-tree path: /api/coops/[coop]/tanks/[tankId] → /api/coops/{coop}/tanks/{tankId}. */
export const openApiPath = (p: string) => p.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, '{$1}');

/** The names of a path's dynamic segments. */
export const pathParamNames = (p: string) => [...p.matchAll(/\[(?:\.\.\.)?([^\]]+)\]/g)].map((m) => m[1]!);
