import { ADMINS, type RouteSpec } from './types';

export const routes: RouteSpec[] = [{ method: 'GET', path: '/api/coops/[coop]/audit', scope: 'coop', allow: ADMINS }];

routes.push({
  method: 'GET',
  path: '/api/coops/[coop]/reports/quarterly',
  scope: 'coop',
  allow: ['admin', 'treasurer'],
});
routes.push({
  method: 'GET',
  path: '/api/coops/[coop]/overview',
  scope: 'coop',
  allow: ['admin', 'treasurer', 'brewer', 'member'],
});
