import { ADMINS, type RouteSpec } from './types';

// Accounts, members and invitations (issue 3). Bodies are empty: authorization comes first.
export const routes: RouteSpec[] = [
  { method: 'GET', path: '/api/coops/[coop]/members', scope: 'coop', allow: ADMINS },
  { method: 'PATCH', path: '/api/coops/[coop]/members/[id]', scope: 'coop', allow: ADMINS, body: {} },
  { method: 'DELETE', path: '/api/coops/[coop]/members/[id]', scope: 'coop', allow: ADMINS },
  { method: 'GET', path: '/api/coops/[coop]/invitations', scope: 'coop', allow: ADMINS },
  { method: 'POST', path: '/api/coops/[coop]/invitations', scope: 'coop', allow: ADMINS, body: {} },
  { method: 'DELETE', path: '/api/coops/[coop]/invitations/[id]', scope: 'coop', allow: ADMINS },
  { method: 'POST', path: '/api/coops/[coop]/invitations/[id]/resend', scope: 'coop', allow: ADMINS },
  {
    method: 'GET',
    path: '/api/invitations/[token]',
    scope: 'public',
    note: 'the token is the credential; unknown → 404',
  },
  { method: 'POST', path: '/api/invitations/[token]', scope: 'public', body: {} },
  { method: 'POST', path: '/api/password-reset', scope: 'public', body: {} },
  { method: 'GET', path: '/api/password-reset/[token]', scope: 'public' },
  { method: 'POST', path: '/api/password-reset/[token]', scope: 'public', body: {} },
  { method: 'GET', path: '/api/me', scope: 'user' },
  { method: 'PATCH', path: '/api/me', scope: 'user', body: {} },
  { method: 'POST', path: '/api/me/password', scope: 'user', body: {} },
  { method: 'POST', path: '/api/me/email', scope: 'user', body: {} },
  {
    method: 'POST',
    path: '/api/me/email/confirm',
    scope: 'public',
    body: {},
    note: 'the e-mailed token is the proof; works without a session',
  },
  { method: 'POST', path: '/api/me/sign-out-everywhere', scope: 'user' },
];
