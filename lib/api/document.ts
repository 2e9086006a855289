import { z } from 'zod';
import {
  createDocument,
  type ZodOpenApiOperationObject,
  type ZodOpenApiPathsObject,
  type ZodOpenApiResponsesObject,
} from 'zod-openapi';
import { isFileBody, isMultipart, openApiPath, pathParamNames, type Operation } from './operation';
import { operations } from './operations';

// The OpenAPI 3.1 document, generated from the declarations in lib/api/operations (zod-openapi
// turns the zod schemas into JSON Schema: request bodies and queries as the client sends them,
// responses as the server answers).

const SECURITY_SCHEMES = {
  sessionCookie: {
    type: 'apiKey',
    in: 'cookie',
    name: 'next-auth.session-token',
    description:
      "The browser session after signing in (`__Secure-next-auth.session-token` over https). Writes must carry the app's own `Origin`.",
  },
  bearerToken: {
    type: 'http',
    scheme: 'bearer',
    description:
      'A personal access token (Settings → API tokens), scoped to one co-op; read-only tokens may only GET. A request with an Authorization header is never authenticated by a cookie.',
  },
} as const;

const slug = z
  .string()
  .regex(/^[a-z0-9-]+$/)
  .describe("The co-op's slug");
const wholeId = z
  .string()
  .regex(/^[1-9][0-9]*$/)
  .describe('A whole id');

function responses(op: Operation): ZodOpenApiResponsesObject {
  const out: Record<string, unknown> = {};
  for (const [status, body] of Object.entries(op.statuses)) {
    const description =
      op.errorDescriptions[Number(status)] ??
      (Number(status) < 300 ? 'Success' : Number(status) < 400 ? 'Redirect' : 'Error');
    if (body === null) {
      out[status] = { description };
      continue;
    }
    const content: Record<string, { schema: z.ZodType }> = {};
    for (const b of Array.isArray(body) ? body : [body]) {
      if (isFileBody(b))
        content[b.file] = {
          schema: z.string().meta({ format: 'binary', ...(b.description ? { description: b.description } : {}) }),
        };
      else content['application/json'] = { schema: b as z.ZodType };
    }
    out[status] = { description, content };
  }
  return out as ZodOpenApiResponsesObject;
}

function toOperation(op: Operation): ZodOpenApiOperationObject {
  const names = pathParamNames(op.path);
  const declared = op.params?.shape ?? {};
  const path = names.length
    ? z.object(
        Object.fromEntries(
          names.map((n) => [n, (declared as Record<string, z.ZodType>)[n] ?? (n === 'coop' ? slug : wholeId)]),
        ),
      )
    : undefined;
  const who =
    op.access === 'public'
      ? 'Anyone.'
      : op.access === 'user'
        ? 'Any signed-in person (session only).'
        : `Roles: ${op.roles.join(', ')}${op.access.note ? ` (${op.access.note})` : ''}. Action \`${op.access.action}\`.`;
  const body =
    op.body === undefined
      ? undefined
      : isMultipart(op.body)
        ? { content: { 'multipart/form-data': { schema: op.body.multipart } } }
        : { content: { 'application/json': { schema: op.body } } };
  return {
    operationId: `${op.method.toLowerCase()}${op.path.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, 'By-$1').replace(/[^A-Za-z0-9]+(.)?/g, (_m, c: string | undefined) => (c ?? '').toUpperCase())}`,
    summary: op.summary,
    description: [op.description, `**Who:** ${who}`].filter(Boolean).join('\n\n'),
    tags: op.tags,
    security:
      op.access === 'public'
        ? []
        : op.access === 'user'
          ? [{ sessionCookie: [] }]
          : [{ sessionCookie: [] }, { bearerToken: [] }],
    'x-roles': [...op.roles],
    ...(typeof op.access === 'object' ? { 'x-action': op.access.action } : {}),
    requestParams: { ...(path ? { path } : {}), ...(op.query ? { query: op.query } : {}) },
    ...(body ? { requestBody: { required: true, ...body } } : {}),
    responses: responses(op),
  };
}

let cached: ReturnType<typeof createDocument> | null = null;

/** The OpenAPI 3.1 document of every declared operation (built once per process). */
export function openApiDocument() {
  if (cached) return cached;
  const paths: ZodOpenApiPathsObject = {};
  for (const op of operations) {
    const item = (paths[openApiPath(op.path)] ??= {}) as Record<string, ZodOpenApiOperationObject>;
    item[op.method.toLowerCase()] = toOperation(op);
  }
  cached = createDocument({
    openapi: '3.1.0',
    info: {
      title: 'Tallyvat API',
      version: '1',
      description:
        'Batches, the shared tank and monthly billing of a biodiesel co-op. Bodies are JSON; money is whole cents; errors are `{ error, fields? }`. Co-op routes live under `/api/coops/{coop}` (the slug). Authenticate with the browser session or a personal access token (`Authorization: Bearer …`).',
    },
    servers: [{ url: '/' }],
    security: [{ sessionCookie: [] }, { bearerToken: [] }],
    components: { securitySchemes: SECURITY_SCHEMES },
    paths,
  });
  return cached;
}
