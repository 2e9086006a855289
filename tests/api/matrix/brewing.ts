import { ALL, BREWERS, type RouteSpec } from './types';

// Brewing: supplies (brewers and admins), the planner, and the batch record (members and
// treasurers read released batches and their certificates only).
const P = '/api/coops/[coop]';
export const routes: RouteSpec[] = [
  { method: 'GET', path: `${P}/supplies/chemicals`, scope: 'coop', allow: BREWERS },
  { method: 'POST', path: `${P}/supplies/chemicals`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: `${P}/supplies/chemicals/[id]/sds`, scope: 'coop', allow: BREWERS },
  { method: 'POST', path: `${P}/supplies/chemicals/[id]/sds`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: `${P}/supplies/oil`, scope: 'coop', allow: BREWERS },
  { method: 'POST', path: `${P}/supplies/oil`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: `${P}/supplies/stock`, scope: 'coop', allow: BREWERS },
  { method: 'POST', path: `${P}/planner`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: `${P}/batches`, scope: 'coop', allow: ALL },
  { method: 'POST', path: `${P}/batches`, scope: 'coop', allow: BREWERS, body: {} },
  {
    method: 'GET',
    path: `${P}/batches/[id]`,
    scope: 'coop',
    allow: ALL,
    note: 'members: released batches only (404 otherwise)',
  },
  { method: 'PATCH', path: `${P}/batches/[id]`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/advance`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/temperatures`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/temperatures/acknowledge`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/release`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/reject`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/files`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'GET', path: `${P}/batches/[id]/files/[fileId]`, scope: 'coop', allow: BREWERS },
  {
    method: 'GET',
    path: `${P}/batches/[id]/certificate`,
    scope: 'coop',
    allow: ALL,
    note: 'members: released batches only',
  },
  // Lineage and recall (issue 19): where a batch's fuel went, reviews, late lab results, the recall report.
  { method: 'GET', path: `${P}/batches/[id]/lineage`, scope: 'coop', allow: ['admin', 'treasurer', 'brewer'] },
  { method: 'GET', path: `${P}/batches/[id]/recall-report`, scope: 'coop', allow: ['admin', 'treasurer', 'brewer'] },
  { method: 'POST', path: `${P}/batches/[id]/review`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/review/close`, scope: 'coop', allow: BREWERS, body: {} },
  { method: 'POST', path: `${P}/batches/[id]/lab-results`, scope: 'coop', allow: BREWERS, body: {} },
];
