import 'server-only';
import type { Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';

/** SQLSTATEs worth one more try: deadlock detected, serialization failure. */
const RETRYABLE = new Set(['40P01', '40001']);

function sqlState(e: unknown): string | undefined {
  const err = e as { original?: { code?: string }; parent?: { code?: string }; code?: string };
  return err?.original?.code ?? err?.parent?.code ?? err?.code;
}

/**
 * Runs fn in one READ COMMITTED transaction (the guarded updates and row locks in lib/tank,
 * lib/reservations and lib/draws rely on it) and retries a couple of times when PostgreSQL
 * resolves a deadlock by aborting us. Everything fn wrote is rolled back when it throws.
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

/** The SQLSTATE of a database error, when there is one (e.g. '23505' unique violation). */
export { sqlState };
