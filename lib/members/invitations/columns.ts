import 'server-only';
import type { IncludeOptions, InferAttributes } from 'sequelize';
import type { Invitation } from '@/models';

// What every read of an invitation asks for: by the members screen and by the invitee's link.

/** The columns every invitation read needs (never the token hash). */
export const INVITATION_ATTRIBUTES = [
  'id',
  'coopId',
  'email',
  'role',
  'status',
  'delivery',
  'expiresAt',
  'createdAt',
] as const satisfies (keyof InferAttributes<Invitation>)[];

/** The inviter's name, joined in the same query. */
export const INVITED_BY: IncludeOptions = { association: 'invitedBy', attributes: ['name'] };

export const isPast = (at: Date) => at.getTime() <= Date.now();
