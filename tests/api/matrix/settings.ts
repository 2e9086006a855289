import { ADMINS, type RouteSpec } from './types';

export const routes: RouteSpec[] = [
  { method: 'GET', path: '/api/coops/[coop]/settings', scope: 'coop', allow: ADMINS },
  { method: 'PUT', path: '/api/coops/[coop]/settings', scope: 'coop', allow: ADMINS, body: {} },
];
