import { z } from 'zod';
import { ROLES } from '@/lib/auth/roles';
import { timeZoneSchema } from './common';

// Shared by the forms (client) and the route handlers (server).

export const emailSchema = z
  .email('Enter a valid e-mail address.')
  .max(254, 'At most 254 characters.')
  .transform((s) => s.trim().toLowerCase());

/** 12–128 characters, no composition rules (NIST SP 800-63B); the common list is checked on the server. */
export const passwordSchema = z
  .string({ error: 'Enter a password.' })
  .min(12, 'Use at least 12 characters.')
  .max(128, 'Use at most 128 characters.');

export const nameSchema = z
  .string({ error: 'Enter a name.' })
  .trim()
  .min(1, 'Enter a name.')
  .max(120, 'At most 120 characters.')
  .regex(/^[^\u0000-\u001f\u007f]*$/, 'Use letters, spaces and punctuation only.');

export const roleSchema = z.enum(ROLES, { error: `Choose one of: ${ROLES.join(', ')}.` });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.').max(128),
});

export const invitationCreateSchema = z.strictObject({ email: emailSchema, role: roleSchema });

export const membershipStatusSchema = z.enum(['active', 'suspended'], { error: 'Choose active or suspended.' });

export const membershipUpdateSchema = z
  .strictObject({ role: roleSchema.optional(), status: membershipStatusSchema.optional() })
  .refine((v) => v.role !== undefined || v.status !== undefined, {
    message: 'Give a role or a status.',
    path: ['role'],
  });

/**
 * Accepting an invitation: a new person sends a name and a password; someone who already has
 * an account is signed in and sends nothing (the service says which fields it needs).
 */
export const invitationAcceptSchema = z.strictObject({
  name: nameSchema.optional(),
  password: passwordSchema.optional(),
});

export const passwordResetRequestSchema = z.strictObject({ email: emailSchema });
export const passwordResetSchema = z.strictObject({ password: passwordSchema });
export const passwordChangeSchema = z.strictObject({
  currentPassword: z.string({ error: 'Enter your current password.' }).min(1, 'Enter your current password.').max(128),
  newPassword: passwordSchema,
});
export const profileUpdateSchema = z.strictObject({ name: nameSchema });
/** Changing the e-mail address asks for the current password, then a link to the new address confirms it. */
export const emailChangeSchema = z.strictObject({
  email: emailSchema,
  currentPassword: z.string({ error: 'Enter your current password.' }).min(1, 'Enter your current password.').max(128),
});
export const emailConfirmSchema = z.strictObject({
  token: z
    .string({ error: 'The link is incomplete.' })
    .min(1, 'The link is incomplete.')
    .max(100, 'The link is not valid.'),
});

export const coopCreateSchema = z.strictObject({
  name: z.string().trim().min(3, 'At least 3 characters.').max(120, 'At most 120 characters.'),
  slug: z
    .string()
    .trim()
    .regex(/^[a-z0-9][a-z0-9-]{1,58}[a-z0-9]$/, 'Use 3–60 lower-case letters, digits and dashes.'),
  units: z.enum(['us', 'metric'], { error: 'Choose US gallons/°F or litres/°C.' }).default('us'),
  timezone: timeZoneSchema.default('America/Chicago'),
});
