/** The four roles a person can hold in a co-op (pure: safe for client components). */
export const ROLES = ['admin', 'treasurer', 'brewer', 'member'] as const;
export type Role = (typeof ROLES)[number];

/** One line per role, as shown on invitations and the members screen (follows the product's roles table). */
export const ROLE_SUMMARY: Record<Role, string> = {
  member: 'reserve and draw fuel, see and pay their own invoices, see released batches',
  brewer: 'everything a member can, plus supplies, batches, the tank ledger and recording draws',
  treasurer: 'everything a member can, plus prices, dues, invoices, payments, month close and reports',
  admin: 'everything, plus invitations, roles, suspensions and co-op settings',
};

/** "an admin", "a brewer" … for sentences. */
export function withArticle(role: Role): string {
  return `${role === 'admin' ? 'an' : 'a'} ${role}`;
}
