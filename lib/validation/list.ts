import { z } from 'zod';

/** Query-string paging and sorting shared by every list route: ?page=1&pageSize=25&sort=col&dir=asc. */
export function listQuerySchema<const S extends readonly [string, ...string[]]>(sortable: S, defaultSort: S[number]) {
  return z.object({
    page: z.coerce.number().int('Whole pages only.').min(1, 'Pages start at 1.').max(100_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200, 'At most 200 rows a page.').default(25),
    sort: z.enum(sortable, { error: `Sort by one of: ${sortable.join(', ')}.` }).default(defaultSort),
    dir: z.enum(['asc', 'desc']).default('desc'),
  });
}

/** The page a list service answers such a query with (rows of one page, and how many match in all). */
export interface Paged<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}
