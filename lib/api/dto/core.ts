import { z } from 'zod';
import { date, int, str, units } from './common';
import { membershipStatus, role } from './members';

// My profile, the co-op's settings and its audit log as the API sends them; lib/account's,
// lib/coops' and lib/audit's DTO types are inferred from these (one definition).

export const myCoopSchema = z
  .object({ slug: str(), name: str(), role, status: membershipStatus })
  .meta({ id: 'MyCoop' });

export const profileSchema = z
  .object({
    id: int(),
    name: str(),
    email: str(),
    pendingEmail: str().nullable().describe('A change of address waiting for its confirmation link'),
    pendingEmailDelivery: z
      .object({ status: z.enum(['queued', 'sent', 'failed']), sentAt: date().nullable() })
      .nullable()
      .describe(
        'The confirmation e-mail of the pending change: queued (retried with back-off while the mail server is away), sent, or failed after every try (ask again to send a new link)',
      ),
    coops: z.array(myCoopSchema.extend({ joinedAt: date(), timezone: str() })),
  })
  .meta({ id: 'Profile' });

export const coopSettingsSchema = z
  .object({
    name: str(),
    slug: str(),
    units,
    timezone: str(),
    currency: str(),
    monthlyDuesCents: int(),
    selfServeDraws: z.boolean(),
    catalyst: z.enum(['KOH', 'NaOH']),
    baseGramsPerLiter: z.number(),
    purityPct: z.number(),
    methanolPct: z.number(),
    qualityStandard: z.enum(['ASTM D6751', 'EN 14214']),
    elevationM: z.number().describe('Elevation of the brewing site, m (0 when not set)'),
  })
  .meta({ id: 'CoopSettings' });

export const auditEventSchema = z
  .object({
    id: str().describe('The BIGINT id, as a string'),
    at: date(),
    actorName: str().nullable(),
    actorEmail: str().nullable(),
    action: str(),
    entityType: str(),
    entityId: str().nullable(),
    // Any entity's fields as they were written to the log: open on purpose.
    before: z.unknown().describe('The entity before the change (JSON), or null'),
    after: z.unknown().describe('The entity after the change (JSON), or null'),
  })
  .meta({ id: 'AuditEvent' });

export const invitationAcceptedSchema = z
  .object({ coop: z.object({ slug: str(), name: str() }), role, email: str(), newAccount: z.boolean() })
  .meta({ id: 'InvitationAccepted' });

// Small answers of my account's writes (lib/account) and of creating a co-op (lib/coops).
export const nameChangedSchema = z.object({ name: str() });
export const passwordChangedSchema = z.object({ changed: z.literal(true) });
export const signedOutSchema = z.object({ signedOut: z.literal(true) });
export const emailChangeRequestedSchema = z.object({
  pendingEmail: str(),
  sent: z.boolean().describe('false when the address is taken (the answer does not tell which)'),
});
/** The account's address: a confirmed change, or the account a reset link is for. */
export const accountEmailSchema = z.object({ email: str() });
export const resetRequestedSchema = z.object({ message: str().describe('The same sentence whatever the address') });
export const coopCreatedSchema = z.object({ id: int(), slug: str(), name: str() });
