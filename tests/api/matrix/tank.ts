import { ALL, BREWERS, TREASURERS, type RouteSpec } from './types';

// Tank, pricing, reservations and draws (issue 5). Bodies are empty: authorization comes first.
const STAFF = ['admin', 'treasurer', 'brewer'] as const;

export const routes: RouteSpec[] = [
  { method: 'GET', path: '/api/coops/[coop]/tanks', scope: 'coop', allow: ALL },
  { method: 'POST', path: '/api/coops/[coop]/tanks', scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: '/api/coops/[coop]/tanks/[tankId]', scope: 'coop', allow: ALL },
  { method: 'PATCH', path: '/api/coops/[coop]/tanks/[tankId]', scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: '/api/coops/[coop]/tanks/[tankId]/movements', scope: 'coop', allow: STAFF },
  { method: 'GET', path: '/api/coops/[coop]/tanks/[tankId]/layers', scope: 'coop', allow: ALL },
  { method: 'POST', path: '/api/coops/[coop]/tanks/[tankId]/dips', scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: '/api/coops/[coop]/tanks/transfers', scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: '/api/coops/[coop]/pricing', scope: 'coop', allow: ALL },
  { method: 'POST', path: '/api/coops/[coop]/pricing', scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'GET', path: '/api/coops/[coop]/reservations', scope: 'coop', allow: ALL },
  { method: 'POST', path: '/api/coops/[coop]/reservations', scope: 'coop', allow: ALL, body: {} },
  { method: 'POST', path: '/api/coops/[coop]/reservations/[reservationId]/cancel', scope: 'coop', allow: ALL },
  { method: 'GET', path: '/api/coops/[coop]/draws', scope: 'coop', allow: ALL },
  // Members may record their own draws only where the co-op has a self-serve pump; the matrix co-op has none.
  {
    method: 'POST',
    path: '/api/coops/[coop]/draws',
    scope: 'coop',
    allow: BREWERS,
    body: {},
    note: 'member → 403 unless settings.selfServeDraws',
  },
  { method: 'POST', path: '/api/coops/[coop]/draws/[drawId]/reverse', scope: 'coop', allow: BREWERS, body: {} },
  // Bench-only (bench/tank.mjs): a 404 unless the server runs with TALLYVAT_BENCH=1, as it never does in tests.
  { method: 'GET', path: '/api/bench/tank-query', scope: 'public', note: '404 outside benchmarks' },
];
