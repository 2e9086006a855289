import 'server-only';
import { col, fn, where } from 'sequelize';

/**
 * A `where` on an e-mail column (the table's `email`, or e.g. `user.email` of an include),
 * ignoring case: an address belongs to one account whatever its case (unique index on
 * lower(email)), and the lookups use that index.
 */
export function emailIs(email: string, column = 'email') {
  return where(fn('lower', col(column)), email.toLowerCase());
}
