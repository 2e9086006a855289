import type { Role } from '@/lib/auth/roles';

/**
 * Who may do what inside a co-op: one table, role → actions. Route handlers and server
 * actions check it through requireMember(); pages only use it to hide buttons.
 * Roles follow the product's table: members see and reserve; brewers also make fuel;
 * treasurers also handle money; admins may do everything.
 */
export const POLICY = {
  'coop:read': ['member', 'brewer', 'treasurer', 'admin'],
  'tank:read': ['member', 'brewer', 'treasurer', 'admin'],
  'reservations:own': ['member', 'brewer', 'treasurer', 'admin'],
  'invoices:own': ['member', 'brewer', 'treasurer', 'admin'],
  'batches:read-released': ['member', 'brewer', 'treasurer', 'admin'],
  'batches:read-all': ['brewer', 'admin'],
  'batches:write': ['brewer', 'admin'],
  'supplies:read': ['brewer', 'admin'],
  'supplies:write': ['brewer', 'admin'],
  'tank:write': ['brewer', 'admin'],
  'draws:record': ['brewer', 'admin'],
  'draws:read-all': ['brewer', 'treasurer', 'admin'],
  'lineage:read': ['brewer', 'treasurer', 'admin'],
  'pricing:write': ['treasurer', 'admin'],
  'billing:manage': ['treasurer', 'admin'],
  'reports:read': ['treasurer', 'admin'],
  'members:manage': ['admin'],
  'settings:manage': ['admin'],
  'audit:read': ['admin'],
  /** Moving in from spreadsheets: bulk invitations and opening records (the admin's job). */
  'imports:manage': ['admin'],
  'tokens:manage': ['treasurer', 'admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof POLICY;

/** True when the role may perform the action. */
export function can(role: Role, action: Action): boolean {
  return (POLICY[action] as readonly Role[]).includes(role);
}
