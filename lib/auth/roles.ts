import type { Role } from '@/models/vocabulary';

/** The four roles a person can hold in a co-op (pure: safe for client components). */
export { ROLES, type Role } from '@/models/vocabulary';

/** What each role may do, worded to follow "you can …" (follows the product's roles table). */
export const ROLE_SUMMARY: Record<Role, string> = {
  member: 'reserve and draw fuel, see and pay the invoices for it, and see the quality of released batches',
  brewer: 'do everything a member can, plus keep supplies, batches and the tank ledger, and record draws',
  treasurer:
    'do everything a member can, plus set prices and dues, and handle invoices, payments, the month close and reports',
  admin: 'do everything, including invitations, roles, suspensions and co-op settings',
};

/** "an admin", "a brewer" … for sentences. */
export function withArticle(role: Role): string {
  return `${role === 'admin' ? 'an' : 'a'} ${role}`;
}
