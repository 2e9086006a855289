import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';

/** What pg-boss needs to run its statements on someone else's connection. */
export interface JobDb {
  executeSql(text: string, values?: unknown[]): Promise<{ rows: Record<string, unknown>[] }>;
}

/**
 * A pg-boss `db` adapter that runs pg-boss's own statements inside a Sequelize transaction, so a
 * job is created exactly when the transaction that asks for it commits (and never when it rolls
 * back). pg-boss writes positional `$1` parameters; they are passed as `bind`.
 */
export function transactionDb(transaction: Transaction): JobDb {
  return {
    async executeSql(text, values) {
      const rows = await sequelize.query<Record<string, unknown>>(text, { bind: values ?? [], type: QueryTypes.SELECT, transaction });
      return { rows };
    },
  };
}
