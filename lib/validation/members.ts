import { z } from 'zod';
import { ROLES } from '@/lib/auth/roles';
import { listQuerySchema } from './list';

/** An empty filter box in a GET form arrives as "": treat it as "no filter". */
const blankAsUndefined = (v: unknown) => (v === '' ? undefined : v);

export const MEMBER_SORTS = ['name', 'email', 'role', 'status', 'joined'] as const;

/** The members table: ?role=&status=&q=&sort=&dir=&page=&pageSize=, filtered and sorted by the server. */
export const memberListQuerySchema = listQuerySchema(MEMBER_SORTS, 'name').extend({
  dir: z.enum(['asc', 'desc']).default('asc'),
  role: z.preprocess(blankAsUndefined, z.enum(ROLES, { error: `Choose one of: ${ROLES.join(', ')}.` }).optional()),
  status: z.preprocess(
    blankAsUndefined,
    z.enum(['active', 'suspended'], { error: 'Choose active or suspended.' }).optional(),
  ),
  q: z.preprocess(blankAsUndefined, z.string().trim().max(100, 'At most 100 characters.').optional()),
});
export type MemberListQuery = z.infer<typeof memberListQuerySchema>;
