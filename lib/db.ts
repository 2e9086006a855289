import 'server-only';
import pg from 'pg';
import { Sequelize, type Transaction } from 'sequelize';

// PostgreSQL BIGINT (int8) and NUMERIC arrive as strings; we parse them on purpose where used.

declare global {
  var __tallyvatSequelize: Sequelize | undefined;
}

function create(): Sequelize {
  // Without DATABASE_URL (e.g. while `next build` collects routes) the instance points nowhere
  // and every query fails; /api/health then reports the database as down.
  const url = process.env.DATABASE_URL ?? 'postgres://unset@127.0.0.1:1/unset';
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    // Connections are kept a minute when idle: a new one plans every statement cold (tens of ms for
    // the first plans), so closing them between bursts costs more than holding them.
    pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 60_000, acquire: 30_000 },
    define: { underscored: true },
  });
}

/** The one Sequelize instance of this process (cached on globalThis so dev reloads reuse it). */
export const sequelize: Sequelize = globalThis.__tallyvatSequelize ?? (globalThis.__tallyvatSequelize = create());

/** SQLSTATEs worth another try: deadlock detected, serialization failure. */
const RETRYABLE = new Set(['40P01', '40001']);

/** The SQLSTATE of a database error (Sequelize wraps pg's error as `original`/`parent`), e.g. '23505'. */
export function sqlState(e: unknown): string | undefined {
  const err = e as { original?: { code?: string }; parent?: { code?: string }; code?: string } | null;
  return err?.original?.code ?? err?.parent?.code ?? err?.code;
}

/**
 * The one transaction helper: runs fn in a READ COMMITTED transaction (guarded updates and row
 * locks rely on it) and runs it again, up to three times in all, when PostgreSQL aborts it to
 * resolve a deadlock or a serialization failure. Everything fn wrote is rolled back when it throws,
 * so fn must not have effects outside the database (send e-mail after it returns).
 */
export async function inTransaction<T>(fn: (t: Transaction) => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await sequelize.transaction(fn);
    } catch (e) {
      if (attempt < 3 && RETRYABLE.has(sqlState(e) ?? '')) continue;
      throw e;
    }
  }
}
