// Holds every API answer a test receives to the published contract: the operation declared for
// the request's method and path (lib/api/operations) must list the answer's status, and the body
// must match that status's schema in the OpenAPI document (checked with ajv), or the test fails.
import { Ajv2020, type ValidateFunction } from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import type { Response } from 'supertest';
import { openApiDocument } from '@/lib/api/document';

type Content = Record<string, { schema?: object }>;
type Op = {
  method: string;
  path: string;
  pattern: RegExp;
  literals: number;
  responses: Record<string, { content?: Content }>;
};

let ops: Op[] | null = null;
const validators = new Map<string, ValidateFunction>();
let ajv: Ajv2020 | null = null;
let components: object = {};

function load(): Op[] {
  if (ops) return ops;
  const doc = openApiDocument() as unknown as {
    paths: Record<string, Record<string, { responses: Op['responses'] }>>;
    components?: object;
  };
  components = doc.components ?? {};
  ajv = new Ajv2020({ strict: false, allErrors: true });
  if (addFormats.default) addFormats.default(ajv as never);
  else (addFormats as unknown as (a: unknown) => void)(ajv);
  ajv.addFormat('binary', true);
  ops = [];
  for (const [path, item] of Object.entries(doc.paths)) {
    const pattern = new RegExp(`^${path.replace(/\{[^}]+\}/g, (m) => (m === '{nextauth}' ? '.+' : '[^/]+'))}$`);
    const literals = path.split('/').filter((s) => s && !s.startsWith('{')).length;
    for (const [method, op] of Object.entries(item))
      ops.push({ method: method.toUpperCase(), path, pattern, literals, responses: op.responses });
  }
  ops.sort((a, b) => b.literals - a.literals);
  return ops;
}

function validator(key: string, schema: object): ValidateFunction {
  let v = validators.get(key);
  if (!v) {
    v = ajv!.compile({ ...schema, components });
    validators.set(key, v);
  }
  return v;
}

/** The declared operation for a request, or null when the path is not one of ours (pages, next-auth). */
export function findOperation(method: string, urlPath: string): Op | null {
  if (!urlPath.startsWith('/api/') || urlPath.startsWith('/api/auth/')) return null;
  return load().find((o) => o.method === method.toUpperCase() && o.pattern.test(urlPath)) ?? null;
}

/**
 * Throws when an answer breaks the contract: an undeclared status, a media type the status does
 * not declare, or a JSON body that does not match the declared schema. Requests to paths that
 * are not declared operations (pages, next-auth's own routes) pass unchecked.
 */
export function checkContract(
  method: string,
  url: string,
  res: Pick<Response, 'status' | 'headers' | 'body' | 'text'>,
): void {
  const path = new URL(url, 'http://x').pathname;
  const op = findOperation(method, path);
  if (!op) return;
  const where = `${method.toUpperCase()} ${path} (declared as ${op.path})`;
  const declared = op.responses[String(res.status)];
  if (!declared) {
    throw new Error(
      `API contract: ${where} answered ${res.status}, which its declaration in lib/api/operations does not list (${Object.keys(op.responses).join(', ')}). Body: ${String(res.text).slice(0, 300)}`,
    );
  }
  if (!declared.content) return;
  const type = String(res.headers['content-type'] ?? '')
    .split(';')[0]!
    .trim();
  const media = declared.content[type];
  if (!media)
    throw new Error(
      `API contract: ${where} answered ${res.status} as ${type || 'no content type'}; declared: ${Object.keys(declared.content).join(', ')}`,
    );
  if (type !== 'application/json' || !media.schema) return;
  const v = validator(`${op.method} ${op.path} ${res.status}`, media.schema);
  if (!v(res.body)) {
    throw new Error(
      `API contract: ${where} answered ${res.status} with a body that does not match its schema: ${ajv!.errorsText(v.errors, { separator: '; ' })}. Body: ${String(res.text).slice(0, 300)}`,
    );
  }
}

const REQUEST_METHODS = new Set(['get', 'post', 'put', 'patch', 'delete', 'del']);

/**
 * Wraps a supertest client or agent so that every request it makes checks its answer against the
 * contract (a broken answer rejects the request with the reason).
 */
export function checkedClient<T extends object>(
  client: T,
  prepare: (test: { set(k: string, v: string): unknown }, method: string) => void = () => {},
): T {
  return new Proxy(client, {
    get(target, prop, receiver) {
      const value = Reflect.get(target, prop, receiver);
      if (typeof prop !== 'string' || !REQUEST_METHODS.has(prop) || typeof value !== 'function') {
        // Chainable setters (agent.set(…)) keep the wrapper.
        if (typeof value === 'function' && (prop === 'set' || prop === 'auth'))
          return (...args: unknown[]) => (value.apply(target, args), receiver);
        return value;
      }
      return (url: string, ...rest: unknown[]) => {
        const test = (
          value as (
            u: string,
            ...r: unknown[]
          ) => { set(k: string, v: string): unknown; expect(fn: (res: Response) => void): unknown }
        ).call(target, url, ...rest);
        const method = prop === 'del' ? 'DELETE' : prop.toUpperCase();
        prepare(test, method);
        test.expect((res: Response) => checkContract(method, url, res));
        return test;
      };
    },
  });
}
