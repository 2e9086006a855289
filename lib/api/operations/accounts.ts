import { z } from 'zod';
import {
  coopCreateSchema,
  emailChangeSchema,
  emailConfirmSchema,
  invitationAcceptSchema,
  invitationCreateSchema,
  membershipUpdateSchema,
  passwordChangeSchema,
  passwordResetRequestSchema,
  passwordResetSchema,
  profileUpdateSchema,
} from '@/lib/validation/auth';
import { memberListQuerySchema } from '@/lib/validation/members';
import { operation } from '../operation';
import { invitationAcceptedSchema, invitationSchema, memberSchema, myCoopSchema, pageOf, profileSchema, role } from '../schemas';

// Accounts: sign-in, my profile, co-ops, members and invitations.

const token = z.object({ token: z.string().describe('The token from the e-mailed link') });
const linkGone = { 410: 'The link was used, revoked or has expired (`reason`).' };

export const operations = [
  operation({ method: 'GET', path: '/api/auth/[...nextauth]', summary: 'Sign-in machinery (next-auth): csrf, session, providers', access: 'public', params: z.object({ nextauth: z.string().describe('csrf, session, providers, signout …') }), responses: { 200: z.unknown(), 302: null }, errors: { 400: 'Unknown action.' }, tags: ['Accounts'] }),
  operation({
    method: 'POST',
    path: '/api/auth/[...nextauth]',
    summary: 'Sign in with e-mail and password, or sign out (next-auth, form-encoded)',
    description: 'Scripts: GET /api/auth/csrf, then POST /api/auth/callback/credentials with csrfToken, email, password and json=true as a form. Failed sign-ins back off exponentially after 10 (429 with Retry-After).',
    access: 'public',
    params: z.object({ nextauth: z.string().describe('callback/credentials, signout …') }),
    responses: { 200: z.unknown(), 302: null },
    errors: { 401: 'Wrong e-mail or password.', 429: 'Too many failed sign-ins: wait Retry-After seconds.' },
    tags: ['Accounts'],
  }),
  operation({ method: 'GET', path: '/api/me', summary: 'My profile and co-ops', access: 'user', responses: { 200: profileSchema }, tags: ['Accounts'] }),
  operation({ method: 'PATCH', path: '/api/me', summary: 'Change my name', access: 'user', body: profileUpdateSchema, responses: { 200: z.looseObject({ name: z.string() }) }, tags: ['Accounts'] }),
  operation({ method: 'POST', path: '/api/me/password', summary: 'Change my password (ends every session)', access: 'user', body: passwordChangeSchema, responses: { 200: z.looseObject({ changed: z.literal(true) }) }, errors: { 429: '5 wrong current passwords in 15 minutes.' }, tags: ['Accounts'] }),
  operation({ method: 'POST', path: '/api/me/email', summary: 'Ask to change my e-mail address (a link goes to the new one)', access: 'user', body: emailChangeSchema, responses: { 202: z.looseObject({ pendingEmail: z.string(), sent: z.boolean() }) }, errors: { 429: '5 wrong current passwords in 15 minutes.' }, tags: ['Accounts'] }),
  operation({ method: 'POST', path: '/api/me/email/confirm', summary: 'Confirm an e-mail change with the link\'s token', access: 'public', body: emailConfirmSchema, responses: { 200: z.looseObject({ email: z.string() }) }, errors: { 404: 'Unknown link.', ...linkGone }, tags: ['Accounts'] }),
  operation({ method: 'POST', path: '/api/me/sign-out-everywhere', summary: 'End every session of mine', access: 'user', responses: { 200: z.looseObject({ signedOut: z.literal(true) }) }, tags: ['Accounts'] }),
  operation({ method: 'POST', path: '/api/password-reset', summary: 'E-mail a password reset link (always the same answer)', access: 'public', body: passwordResetRequestSchema, responses: { 202: z.looseObject({ message: z.string() }) }, tags: ['Accounts'] }),
  operation({ method: 'GET', path: '/api/password-reset/[token]', summary: 'Check a password reset link', access: 'public', params: token, responses: { 200: z.looseObject({ email: z.string() }) }, errors: { 404: 'Unknown link.', ...linkGone }, tags: ['Accounts'] }),
  operation({ method: 'POST', path: '/api/password-reset/[token]', summary: 'Set a new password with a reset link', access: 'public', params: token, body: passwordResetSchema, responses: { 200: z.looseObject({ email: z.string() }) }, errors: { 404: 'Unknown link.', ...linkGone }, tags: ['Accounts'] }),
  operation({
    method: 'GET',
    path: '/api/invitations/[token]',
    summary: 'What an invitation link offers',
    access: 'public',
    params: token,
    responses: { 200: z.looseObject({ coop: z.looseObject({ name: z.string(), slug: z.string() }), role, email: z.string(), expiresAt: z.string(), account: z.enum(['new', 'signed-in', 'sign-in-needed', 'other-account']) }) },
    errors: { 404: 'Unknown link.', ...linkGone },
    tags: ['Accounts'],
  }),
  operation({ method: 'POST', path: '/api/invitations/[token]', summary: 'Accept an invitation (new account, or signed in as the invited address)', access: 'public', params: token, body: invitationAcceptSchema, responses: { 201: invitationAcceptedSchema }, errors: { 401: 'Sign in as the invited address.', 403: 'Signed in as someone else.', 404: 'Unknown link.', ...linkGone }, tags: ['Accounts'] }),
  operation({ method: 'GET', path: '/api/coops', summary: 'My co-ops with my role and status', access: 'user', responses: { 200: z.looseObject({ coops: z.array(myCoopSchema) }) }, tags: ['Co-ops'] }),
  operation({ method: 'POST', path: '/api/coops', summary: 'Create a co-op (I become its admin)', access: 'user', body: coopCreateSchema, responses: { 201: z.looseObject({ slug: z.string() }) }, tags: ['Co-ops'] }),
  operation({ method: 'GET', path: '/api/coops/[coop]/members', summary: 'Members with role and status', access: { action: 'members:manage' }, query: memberListQuerySchema, responses: { 200: pageOf(memberSchema).extend({ activeAdmins: z.number().int() }) }, tags: ['Members'] }),
  operation({ method: 'PATCH', path: '/api/coops/[coop]/members/[id]', summary: 'Change a member\'s role, suspend or reinstate', access: { action: 'members:manage' }, body: membershipUpdateSchema, responses: { 200: memberSchema }, errors: { 409: 'The co-op\'s last active admin.' }, tags: ['Members'] }),
  operation({ method: 'DELETE', path: '/api/coops/[coop]/members/[id]', summary: 'Remove a member (the account stays)', access: { action: 'members:manage' }, responses: { 200: z.looseObject({ removed: z.literal(true), id: z.number().int() }) }, errors: { 409: 'The last active admin, or records that must stay (suspend instead).' }, tags: ['Members'] }),
  operation({ method: 'GET', path: '/api/coops/[coop]/invitations', summary: 'Pending invitations', access: { action: 'members:manage' }, responses: { 200: z.object({ invitations: z.array(invitationSchema) }) }, tags: ['Members'] }),
  operation({ method: 'POST', path: '/api/coops/[coop]/invitations', summary: 'Invite someone by e-mail (the worker sends a 7-day single-use link)', access: { action: 'members:manage' }, body: invitationCreateSchema, responses: { 201: z.object({ invitation: invitationSchema, queued: z.literal(true) }) }, errors: { 409: 'Already a member, or a pending invitation exists.' }, tags: ['Members'] }),
  operation({ method: 'POST', path: '/api/coops/[coop]/invitations/[id]/resend', summary: 'Send an invitation again with a new link', access: { action: 'members:manage' }, responses: { 200: z.object({ invitation: invitationSchema, queued: z.literal(true) }) }, errors: { 409: 'Not pending.' }, tags: ['Members'] }),
  operation({ method: 'DELETE', path: '/api/coops/[coop]/invitations/[id]', summary: 'Revoke a pending invitation', access: { action: 'members:manage' }, responses: { 200: z.looseObject({ revoked: z.literal(true), id: z.number().int() }) }, errors: { 409: 'Not pending.' }, tags: ['Members'] }),
];
