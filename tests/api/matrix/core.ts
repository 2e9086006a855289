import type { RouteSpec } from './types';

export const routes: RouteSpec[] = [
  { method: 'GET', path: '/api/health', scope: 'public' },
  { method: 'GET', path: '/api/live', scope: 'public' },
  { method: 'GET', path: '/api/ready', scope: 'public' },
  { method: 'GET', path: '/api/openapi.json', scope: 'public', note: 'the API contract; reveals no co-op data' },
  { method: 'GET', path: '/api/auth/[...nextauth]', scope: 'public', params: { '...nextauth': 'csrf' } },
  { method: 'POST', path: '/api/auth/[...nextauth]', scope: 'public', params: { '...nextauth': 'signout' } },
  { method: 'GET', path: '/api/coops', scope: 'user' },
  { method: 'POST', path: '/api/coops', scope: 'user', body: {} },
];
