import { z } from 'zod';
import { ROLES } from '@/models/vocabulary';
import { date, int, str } from './common';

// Members, invitations and access tokens as the API sends them; lib/members', lib/members/invitations'
// and lib/api-tokens' DTO types are inferred from these (one definition).

export const role = z.enum(ROLES);
export const membershipStatus = z.enum(['active', 'suspended']);

export const memberSchema = z
  .object({
    id: int(),
    userId: int(),
    role,
    status: membershipStatus,
    name: str(),
    email: str(),
    joinedAt: date(),
    isYou: z.boolean().describe('The row of the admin looking at the table'),
  })
  .meta({ id: 'Member' });

export const apiTokenSchema = z
  .object({
    id: int(),
    name: str(),
    access: z.enum(['read', 'write']),
    prefix: str().describe('The first characters of the token, to recognise it'),
    createdBy: str().nullable(),
    createdAt: date(),
    lastUsedAt: date().nullable().describe('Recorded at most once an hour'),
    revokedAt: date().nullable(),
  })
  .meta({ id: 'ApiToken' });

export const invitationSchema = z
  .object({
    id: int(),
    email: str(),
    role,
    delivery: z
      .enum(['queued', 'sent', 'not-sent'])
      .describe(
        'The e-mail: queued (the worker has it, retrying with back-off if the mail server is away), sent (the server took it), not-sent (every try failed: the dead letter; resend it)',
      ),
    sentAt: date()
      .nullable()
      .describe(
        "When the mail server last took this invitation's e-mail (the send ledger); null before the first send",
      ),
    expiresAt: date(),
    createdAt: date(),
    invitedBy: str().nullable(),
    expired: z.boolean().describe('Past its expiry: the link no longer works; resending makes a new one'),
  })
  .meta({ id: 'Invitation' });

export const invitationInfoSchema = z
  .object({
    coop: z.object({ name: str(), slug: str() }),
    role,
    roleSummary: str().describe('What the role may do, in a sentence'),
    email: str(),
    invitedBy: str().nullable(),
    expiresAt: date(),
    account: z
      .enum(['new', 'signed-in', 'sign-in-needed', 'other-account'])
      .describe('Who is opening the link, relative to the invited address'),
    signedInAs: str().nullable().describe("The signed-in visitor's address, if any"),
  })
  .meta({ id: 'InvitationInfo' });

/** A member removed or an invitation revoked: what and that it happened. */
export const removedSchema = z.object({ removed: z.literal(true), id: int() });
export const revokedSchema = z.object({ revoked: z.literal(true), id: int() });
