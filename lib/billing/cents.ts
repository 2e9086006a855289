/**
 * PostgreSQL BIGINT and NUMERIC (and SUMs of them) arrive as strings, an empty SUM as null:
 * parse money on purpose. Cents stay well inside 2^53. Pure (safe for client components).
 */
export function cents(v: string | number | null | undefined): number {
  return v === null || v === undefined ? 0 : Number(v);
}
