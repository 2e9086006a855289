// Shared by the security tests: the route files on disk, and every table's row count.
import { sql } from '../support/api';

export { routesOnDisk, type Method } from '../support/routes';

/** Row counts of every table in the database, for "nothing was written" checks. */
export async function allRowCounts(): Promise<Record<string, number>> {
  const tables = await sql<{ t: string }>(
    `SELECT quote_ident(table_name) AS t FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`,
  );
  const union = tables.map(({ t }) => `SELECT '${t}' AS t, count(*)::int AS n FROM ${t}`).join(' UNION ALL ');
  const rows = await sql<{ t: string; n: number }>(union);
  return Object.fromEntries(rows.map((r) => [r.t, r.n]));
}
