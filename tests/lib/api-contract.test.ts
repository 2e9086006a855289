// The API contract (lib/api): every route handler on disk is declared, and the OpenAPI document
// generated from the declarations is valid OpenAPI 3.1.
import SwaggerParser from '@apidevtools/swagger-parser';
import { describe, expect, it } from 'vitest';
import { openApiDocument } from '@/lib/api/document';
import { openApiPath } from '@/lib/api/operation';
import { operations } from '@/lib/api/operations';
import { routesOnDisk } from '../support/routes';

const key = (o: { method: string; path: string }) => `${o.method} ${o.path}`;

describe('API declarations', () => {
  const declared = new Set(operations.map(key));
  const onDisk = routesOnDisk().map(key);

  it('declares every route handler method on disk (lib/api/operations/<domain>.ts)', () => {
    const missing = onDisk.filter((r) => !declared.has(r));
    expect(
      missing,
      `route handlers without a declaration — add operation({ method, path, summary, access, params?, query?, body?, responses }) to lib/api/operations/<domain>.ts for: ${missing.join(', ')}`,
    ).toEqual([]);
  });

  it('declares nothing that has no route handler', () => {
    const orphans = [...declared].filter((r) => !onDisk.includes(r));
    expect(orphans, `declarations without a route file: ${orphans.join(', ')}`).toEqual([]);
  });

  it('declares each operation once', () => {
    expect(operations.length).toBe(declared.size);
  });

  it('gives every co-op operation its roles from the policy', () => {
    for (const op of operations.filter((o) => o.path.startsWith('/api/coops/[coop]'))) {
      expect(typeof op.access, key(op)).toBe('object');
      expect(op.roles.length, key(op)).toBeGreaterThan(0);
    }
  });
});

describe('OpenAPI document', () => {
  const doc = openApiDocument();

  it('is a valid OpenAPI 3.1 document (swagger-parser)', async () => {
    const copy = structuredClone(doc);
    await expect(SwaggerParser.validate(copy as never)).resolves.toBeTruthy();
    expect(doc.openapi).toBe('3.1.0');
  });

  it('has the session cookie and bearer token schemes, and roles on every co-op operation', () => {
    expect(Object.keys(doc.components?.securitySchemes ?? {}).sort()).toEqual(['bearerToken', 'sessionCookie']);
    const tanks = doc.paths?.['/api/coops/{coop}/tanks']?.post as Record<string, unknown>;
    expect(tanks['x-roles']).toEqual(['brewer', 'admin']);
    expect(tanks.security).toEqual([{ sessionCookie: [] }, { bearerToken: [] }]);
    expect((doc.paths?.['/api/me']?.get as Record<string, unknown>).security).toEqual([{ sessionCookie: [] }]);
  });

  it('lists every declared operation under its OpenAPI path', () => {
    for (const op of operations)
      expect(doc.paths?.[openApiPath(op.path)]?.[op.method.toLowerCase() as 'get'], key(op)).toBeTruthy();
  });
});
