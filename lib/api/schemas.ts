import { z } from 'zod';
import { membershipStatus, role } from './dto/members';

// Response bodies as the API sends them (JSON after serialisation: dates are ISO strings, money
// whole cents, volumes in litres and in the co-op's unit). The DTOs the screens read are exact
// z.objects in lib/api/dto/<domain>.ts, and the services' DTO types are inferred from them: an
// undeclared field fails the tests' response checks (tests/support/contract.ts), and a renamed
// one is a compile error in the server and in the components using the typed client. The
// schemas still "loose" here (fields not listed may appear) are the ones not yet tightened.

export * from './dto/billing';
export * from './dto/brewing';
export { itemsOf, pageOf } from './dto/common';
export * from './dto/members';
export * from './dto/tank';

const int = () => z.number().int();
const num = () => z.number();
const str = () => z.string();
const date = () => z.string().describe('ISO 8601 date-time');
const nullable = <T extends z.ZodType>(t: T) => t.nullable();

/** Every error answer: a sentence a person understands, and for bad input each field's reasons. */
export const errorSchema = z
  .looseObject({
    error: str().describe('What went wrong, in a sentence'),
    fields: z.record(z.string(), z.array(z.string())).optional().describe('Field → reasons (422)'),
    code: str().optional().describe('A stable code for some errors (database-unavailable, locked, duplicate …)'),
    requestId: str().optional().describe('Quote this when reporting a 500'),
    retryAfter: num().optional(),
  })
  .meta({ id: 'Error' });

export const okSchema = z.looseObject({});

export const myCoopSchema = z.looseObject({ slug: str(), name: str(), role, status: membershipStatus });

export const profileSchema = z
  .looseObject({
    id: int(),
    name: str(),
    email: str(),
    pendingEmail: nullable(str()),
    pendingEmailDelivery: z
      .object({ status: z.enum(['queued', 'sent', 'failed']), sentAt: nullable(date()) })
      .nullable()
      .describe('The confirmation e-mail of the pending change: queued (retried with back-off while the mail server is away), sent, or failed after every try (ask again to send a new link)'),
    coops: z.array(myCoopSchema.extend({ joinedAt: date(), timezone: str() })),
  })
  .meta({ id: 'Profile' });

export const batchSchema = z.looseObject({ id: int(), number: int(), status: str() }).meta({ id: 'Batch', description: 'A batch: recipe, steps, temperatures, quality, costs (brewers and admins see every field; others a released batch\'s summary).' });

export const temperatureSchema = z.looseObject({ id: z.union([int(), str()]) }).meta({ id: 'Temperature' });

export const reconciliationSchema = z.looseObject({}).meta({ id: 'Reconciliation', description: 'Invoices due / paid / outstanding, money received and where it went, unmatched payments, checks, and what blocks closing.' });

export const coopSettingsSchema = z
  .looseObject({ name: str(), slug: str(), units: z.enum(['us', 'metric']), timezone: str(), currency: str() })
  .meta({ id: 'CoopSettings' });

export const auditEventSchema = z.looseObject({ id: z.union([int(), str()]), action: str(), entityType: str() }).meta({ id: 'AuditEvent' });
