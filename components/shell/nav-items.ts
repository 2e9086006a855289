import type { Action } from '@/lib/auth/policies';

/** The co-op navigation; each item shows only to roles whose policy allows `action`. */
export const NAV_ITEMS: { href: string; label: string; action: Action }[] = [
  { href: '', label: 'Overview', action: 'coop:read' },
  { href: '/tank', label: 'Tank', action: 'tank:read' },
  { href: '/me', label: 'My fuel', action: 'reservations:own' },
  { href: '/draws', label: 'Draws', action: 'draws:read-all' },
  { href: '/batches', label: 'Batches', action: 'batches:read-released' },
  { href: '/planner', label: 'Planner', action: 'batches:write' },
  { href: '/supplies', label: 'Supplies', action: 'supplies:read' },
  { href: '/invoices', label: 'My invoices', action: 'invoices:own' },
  { href: '/billing', label: 'Billing', action: 'billing:manage' },
  { href: '/reports', label: 'Reports', action: 'reports:read' },
  { href: '/members', label: 'Members', action: 'members:manage' },
  { href: '/imports', label: 'Import', action: 'imports:manage' },
  { href: '/audit', label: 'Audit log', action: 'audit:read' },
  { href: '/settings', label: 'Settings', action: 'settings:manage' },
  { href: '/api-tokens', label: 'API tokens', action: 'tokens:manage' },
];
