// The typed client's types (lib/api/client/types.ts) are generated from the OpenAPI document by
// openapi-typescript; this fails when the committed file is stale. Regenerate with
// `npm run api:types` (the same test with UPDATE_API_TYPES=1 writes the file).
import fs from 'node:fs';
import path from 'node:path';
import openapiTS from 'openapi-typescript';
import { expect, it } from 'vitest';
import { openApiDocument } from '@/lib/api/document';

const FILE = path.resolve('lib/api/client/types.ts');
const HEADER =
  '// Generated from the OpenAPI document by `npm run api:types` (openapi-typescript). Do not edit.\n/* eslint-disable */\n';

it('lib/api/client/types.ts is generated from the current OpenAPI document', async () => {
  const generated = HEADER + (await openapiTS(structuredClone(openApiDocument()) as never, { exportType: false }));
  if (process.env.UPDATE_API_TYPES === '1') fs.writeFileSync(FILE, generated);
  const committed = fs.existsSync(FILE) ? fs.readFileSync(FILE, 'utf8') : '';
  expect(committed === generated, 'lib/api/client/types.ts is stale: run `npm run api:types` and commit it').toBe(true);
});
