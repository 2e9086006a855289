import { ALL, TREASURERS, type RouteSpec } from './types';

const B = '/api/coops/[coop]/billing';
const month = { period: '2026-11' };

export const routes: RouteSpec[] = [
  // Treasurer / admin: invoicing runs and months
  { method: 'POST', path: `${B}/runs`, scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'GET', path: `${B}/runs/[id]`, scope: 'coop', allow: TREASURERS },
  { method: 'GET', path: `${B}/periods/[period]`, scope: 'coop', allow: TREASURERS, params: month },
  { method: 'POST', path: `${B}/periods/[period]/issue`, scope: 'coop', allow: TREASURERS, params: month, body: {} },
  { method: 'POST', path: `${B}/periods/[period]/send`, scope: 'coop', allow: TREASURERS, params: month, body: {} },
  { method: 'GET', path: `${B}/periods/[period]/reconciliation`, scope: 'coop', allow: TREASURERS, params: month },
  { method: 'POST', path: `${B}/periods/[period]/close`, scope: 'coop', allow: TREASURERS, params: month, body: {} },
  { method: 'GET', path: `${B}/periods/[period]/export`, scope: 'coop', allow: TREASURERS, params: month },
  // Invoices
  { method: 'GET', path: `${B}/invoices`, scope: 'coop', allow: TREASURERS },
  { method: 'GET', path: `${B}/invoices/[id]`, scope: 'coop', allow: TREASURERS },
  { method: 'GET', path: `${B}/invoices/[id]/pdf`, scope: 'coop', allow: TREASURERS },
  { method: 'POST', path: `${B}/invoices/[id]/void`, scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'POST', path: `${B}/invoices/[id]/send`, scope: 'coop', allow: TREASURERS, body: {} },
  // Payments, refunds, adjustments
  { method: 'GET', path: `${B}/payments`, scope: 'coop', allow: TREASURERS },
  { method: 'POST', path: `${B}/payments`, scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'POST', path: `${B}/payments/[id]/match`, scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'POST', path: `${B}/payments/[id]/refunds`, scope: 'coop', allow: TREASURERS, body: {} },
  { method: 'POST', path: `${B}/refunds/[id]/retry`, scope: 'coop', allow: TREASURERS },
  { method: 'GET', path: `${B}/adjustments`, scope: 'coop', allow: TREASURERS },
  { method: 'POST', path: `${B}/adjustments`, scope: 'coop', allow: TREASURERS, body: {} },
  // A member's own invoices (every role is a member of the co-op)
  { method: 'GET', path: '/api/coops/[coop]/invoices', scope: 'coop', allow: ALL },
  { method: 'GET', path: '/api/coops/[coop]/invoices/[id]', scope: 'coop', allow: ALL },
  { method: 'GET', path: '/api/coops/[coop]/invoices/[id]/pdf', scope: 'coop', allow: ALL },
  { method: 'POST', path: '/api/coops/[coop]/invoices/[id]/pay', scope: 'coop', allow: ALL, body: {} },
  // The payments provider's events: public, signature-verified (no signature → 400)
  { method: 'POST', path: '/api/payments/webhook', scope: 'public', body: {} },
];
