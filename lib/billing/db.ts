import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';

/** Bound parameters ($name in the SQL), sent to PostgreSQL as real parameters (arrays included). */
export type Bind = Record<string, unknown>;

/** Runs a SELECT (or a statement with RETURNING) and returns its rows. */
export async function select<T extends object>(sql: string, bind: Bind, t?: Transaction): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t });
}

/** Runs a write and returns the number of rows it touched. */
export async function exec(sql: string, bind: Bind, t?: Transaction): Promise<number> {
  const [, meta] = (await sequelize.query(sql, { bind, transaction: t })) as [unknown, { rowCount?: number } | number];
  return typeof meta === 'number' ? meta : (meta?.rowCount ?? 0);
}

/** PostgreSQL BIGINT/NUMERIC arrive as strings: parse on purpose (cents stay well inside 2^53). */
export const int = (v: unknown): number => (v === null || v === undefined ? 0 : Number(v));
