/** The four roles a person can hold in a co-op (pure: safe for client components). */
export const ROLES = ['admin', 'treasurer', 'brewer', 'member'] as const;
export type Role = (typeof ROLES)[number];
