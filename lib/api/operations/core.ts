import { z } from 'zod';
import { auditQuerySchema } from '@/lib/validation/audit';
import { quarterlyReportQuerySchema } from '@/lib/validation/reports';
import { apiTokenCreateSchema } from '@/lib/validation/api-tokens';
import { coopSettingsUpdateSchema } from '@/lib/validation/settings';
import { operation } from '../operation';
import {
  apiTokenSchema,
  auditEventSchema,
  coopSettingsSchema,
  overviewSchema,
  pageOf,
  quarterlyReportSchema,
  tankMixing,
} from '../schemas';

// The service itself, the co-op's overview, settings, audit log and reports.

/** The tank list's query rows as the bench probe sends them: the model's raw row (NUMERIC and BIGINT as strings). */
const benchTankRowSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  active: z.boolean(),
  capacityLiters: z.string(),
  onHandLiters: z.string(),
  reservedLiters: z.string(),
  heldLiters: z.string(),
  mixing: tankMixing,
  valueCents: z.string(),
  lapsedLiters: z.string(),
  lastDipAt: z.string().nullable(),
});

export const operations = [
  operation({
    method: 'GET',
    path: '/api/health',
    summary: 'Is the service and its database up?',
    access: 'public',
    responses: {
      200: z.object({ status: z.literal('ok'), db: z.literal('ok') }),
      503: z.object({ status: z.literal('degraded'), db: z.literal('down') }),
    },
    tags: ['Service'],
  }),
  operation({
    method: 'GET',
    path: '/api/live',
    summary: 'Liveness: the process answers (no I/O)',
    access: 'public',
    responses: { 200: z.object({ status: z.literal('alive') }) },
    tags: ['Service'],
  }),
  operation({
    method: 'GET',
    path: '/api/ready',
    summary: 'Readiness: the database and the object store answer',
    access: 'public',
    responses: {
      200: z.object({ status: z.literal('ready'), db: z.literal('ok'), storage: z.literal('ok') }),
      503: z.object({
        status: z.literal('not-ready'),
        db: z.enum(['ok', 'down']),
        storage: z.enum(['ok', 'down', 'not-configured']),
      }),
    },
    tags: ['Service'],
  }),
  operation({
    method: 'GET',
    path: '/api/openapi.json',
    summary: "This API's OpenAPI 3.1 document",
    access: 'public',
    // The document itself: its shape is the OpenAPI 3.1 specification's, not ours to restate.
    responses: { 200: z.looseObject({ openapi: z.string() }) },
    tags: ['Service'],
  }),
  operation({
    method: 'GET',
    path: '/api/bench/tank-query',
    summary: 'Benchmark probe (404 unless the server runs benchmarks)',
    access: 'public',
    query: z.object({ coop: z.string().optional() }),
    responses: { 200: z.object({ tanks: z.array(benchTankRowSchema) }) },
    errors: { 404: 'Not a benchmark server, or no such co-op.' },
    tags: ['Service'],
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/overview',
    summary: "The co-op's first screen: tank, price, my account; more sections by role",
    access: { action: 'coop:read' },
    responses: { 200: overviewSchema },
    tags: ['Co-ops'],
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/settings',
    summary: "The co-op's settings",
    access: { action: 'settings:manage' },
    responses: { 200: coopSettingsSchema },
    tags: ['Co-ops'],
  }),
  operation({
    method: 'PUT',
    path: '/api/coops/[coop]/settings',
    summary: "Change the co-op's settings",
    access: { action: 'settings:manage' },
    body: coopSettingsUpdateSchema,
    responses: { 200: coopSettingsSchema },
    tags: ['Co-ops'],
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/audit',
    summary: 'Audit events, newest first',
    access: { action: 'audit:read' },
    query: auditQuerySchema,
    responses: { 200: pageOf(auditEventSchema) },
    tags: ['Co-ops'],
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/reports/quarterly',
    summary: 'Quarterly fuel volumes: produced, released, drawn by declared use (JSON, CSV or PDF)',
    access: { action: 'reports:read' },
    query: quarterlyReportQuerySchema,
    responses: {
      200: [quarterlyReportSchema, { file: 'text/csv' }, { file: 'application/pdf' }],
    },
    description: 'With `format=csv` a text/csv attachment, with `format=pdf` a PDF.',
    tags: ['Reports'],
  }),
  operation({
    method: 'GET',
    path: '/api/coops/[coop]/tokens',
    summary: "The co-op's personal access tokens (never the token itself)",
    access: { action: 'tokens:manage', note: 'from a signed-in session' },
    responses: { 200: z.object({ tokens: z.array(apiTokenSchema) }) },
    tags: ['Access tokens'],
  }),
  operation({
    method: 'POST',
    path: '/api/coops/[coop]/tokens',
    summary: 'Create a personal access token (`secret` is shown only in this answer)',
    description:
      "The token acts in this co-op only, with its creator's current role; `read` tokens may only GET. Send it as `Authorization: Bearer <secret>`.",
    access: { action: 'tokens:manage', note: 'from a signed-in session' },
    body: apiTokenCreateSchema,
    responses: {
      201: z.object({
        token: apiTokenSchema,
        secret: z.string().describe('tvt_… — store it now; only its SHA-256 is kept'),
      }),
    },
    tags: ['Access tokens'],
  }),
  operation({
    method: 'DELETE',
    path: '/api/coops/[coop]/tokens/[id]',
    summary: 'Revoke a token',
    access: { action: 'tokens:manage', note: 'from a signed-in session' },
    responses: { 200: apiTokenSchema },
    errors: { 409: 'Already revoked.' },
    tags: ['Access tokens'],
  }),
];
