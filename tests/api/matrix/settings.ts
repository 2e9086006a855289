import { ADMINS, TREASURERS, type RouteSpec } from './types';

export const routes: RouteSpec[] = [
  { method: 'GET', path: '/api/coops/[coop]/settings', scope: 'coop', allow: ADMINS },
  { method: 'PUT', path: '/api/coops/[coop]/settings', scope: 'coop', allow: ADMINS, body: {} },
  { method: 'GET', path: '/api/coops/[coop]/tokens', scope: 'coop', allow: TREASURERS },
  { method: 'POST', path: '/api/coops/[coop]/tokens', scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'DELETE', path: '/api/coops/[coop]/tokens/[id]', scope: 'coop', allow: TREASURERS },
];
