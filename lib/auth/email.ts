import 'server-only';
import { col, fn, where } from 'sequelize';

/**
 * A `where` on a table's `email` column, ignoring case: an address belongs to one account
 * whatever its case (unique index on lower(email)), and the lookups use that index.
 */
export function emailIs(email: string) {
  return where(fn('lower', col('email')), email.toLowerCase());
}
