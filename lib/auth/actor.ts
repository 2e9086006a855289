import type { InferAttributes } from 'sequelize';
import type { Role } from '@/lib/auth/roles';
import type { Coop, User } from '@/models';

// The acting person's shape, apart from how it is read (lib/auth/session.ts for cookies,
// lib/auth/api-tokens.ts for bearer tokens), so neither reader imports the other for it.

export type SessionUser = Pick<InferAttributes<User>, 'id' | 'email' | 'name'>;

export type ActorCoop = Pick<
  InferAttributes<Coop>,
  'id' | 'slug' | 'name' | 'units' | 'currency' | 'timezone' | 'settings'
>;

/** The acting member: who, in which co-op, with which role. Passed first to every lib/ service. */
export interface Actor {
  user: SessionUser;
  coop: ActorCoop;
  role: Role;
  membershipId: number;
  /** Set when the request was authenticated by a personal access token (lib/auth/api-tokens.ts). */
  apiTokenId?: number;
}
