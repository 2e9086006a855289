import { ADMINS, type RouteSpec } from './types';

// Imports from spreadsheets (issue 20): admins only. Bodies are empty: authorization comes first.
const kind = { kind: 'invitations' };
export const routes: RouteSpec[] = [
  { method: 'GET', path: '/api/coops/[coop]/imports', scope: 'coop', allow: ADMINS },
  { method: 'POST', path: '/api/coops/[coop]/imports/[kind]', scope: 'coop', allow: ADMINS, body: {}, params: kind },
  {
    method: 'POST',
    path: '/api/coops/[coop]/imports/[kind]/preview',
    scope: 'coop',
    allow: ADMINS,
    body: {},
    params: kind,
  },
  { method: 'GET', path: '/api/coops/[coop]/imports/[kind]/template', scope: 'coop', allow: ADMINS, params: kind },
  { method: 'GET', path: '/api/coops/[coop]/imports/[kind]/[id]', scope: 'coop', allow: ADMINS, params: kind },
  { method: 'GET', path: '/api/coops/[coop]/imports/[kind]/[id]/result', scope: 'coop', allow: ADMINS, params: kind },
  { method: 'POST', path: '/api/coops/[coop]/imports/[kind]/[id]/undo', scope: 'coop', allow: ADMINS, params: kind },
];
