import { z } from 'zod';

// Response bodies as the API sends them (JSON after serialisation: dates are ISO strings, money
// whole cents, volumes in litres and in the co-op's unit). The DTOs the screens read are exact
// z.objects in lib/api/dto/<domain>.ts, and the services' DTO types are inferred from them: an
// undeclared field fails the tests' response checks (tests/support/contract.ts), and a renamed
// one is a compile error in the server and in the components using the typed client.

export * from './dto/batch';
export * from './dto/billing';
export * from './dto/brewing';
export * from './dto/core';
export { itemsOf, pageOf } from './dto/common';
export * from './dto/imports';
export * from './dto/lineage';
export * from './dto/members';
export * from './dto/overview';
export * from './dto/reports';
export * from './dto/tank';

const num = () => z.number();
const str = () => z.string();

/**
 * Every error answer: a sentence a person understands, and for bad input each field's reasons.
 * Open on purpose: a refusal may add its own details beside these (HttpError's `extra`: the
 * earlier `importId` of a 409, the `rows` of a refused import, a link's `reason` for its 410).
 */
export const errorSchema = z
  .looseObject({
    error: str().describe('What went wrong, in a sentence'),
    fields: z.record(z.string(), z.array(z.string())).optional().describe('Field → reasons (422)'),
    code: str().optional().describe('A stable code for some errors (database-unavailable, locked, duplicate …)'),
    requestId: str().optional().describe('Quote this when reporting a 500'),
    retryAfter: num().optional(),
  })
  .meta({ id: 'Error' });
