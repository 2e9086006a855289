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

/**
 * The state of one pg-boss job (`created`, `retry`, `active`, `completed`, `cancelled`, `failed`),
 * or null when it is gone (deleted by retention). `ref` is `queue:id`, as the mail ledger keeps it.
 */
export async function jobState(ref: string): Promise<string | null> {
  const at = ref.lastIndexOf(':');
  const [queue, id] = [ref.slice(0, at), ref.slice(at + 1)];
  if (!/^[0-9a-f-]{36}$/i.test(id)) return null;
  const rows = await sequelize.query<{ state: string }>('SELECT state::text AS state FROM pgboss.job WHERE name = $1 AND id = $2::uuid', {
    bind: [queue, id],
    type: QueryTypes.SELECT,
  });
  return rows[0]?.state ?? null;
}
