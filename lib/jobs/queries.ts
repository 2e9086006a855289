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
      const rows = await sequelize.query<Record<string, unknown>>(text, {
        bind: values ?? [],
        type: QueryTypes.SELECT,
        transaction,
      });
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
  const rows = await sequelize.query<{ state: string }>(
    'SELECT state::text AS state FROM pgboss.job WHERE name = $1 AND id = $2::uuid',
    {
      bind: [queue, id],
      type: QueryTypes.SELECT,
    },
  );
  return rows[0]?.state ?? null;
}

/**
 * Which of these singleton keys (`invoice.42`, `invitation.7`: one message each) already have a
 * live job in the queue — waiting or retrying, and running unless `waitingOnly` — so a producer
 * does not queue a second one for the same message. Inside a transaction, its snapshot is read.
 * Written as two probes that pg-boss's own partial indexes serve (queued jobs by key; running jobs).
 */
export async function liveJobKeys(
  queue: string,
  keys: string[],
  transaction?: Transaction,
  waitingOnly = false,
): Promise<Set<string>> {
  if (keys.length === 0) return new Set();
  const waiting = `SELECT singleton_key AS key FROM pgboss.job WHERE name = $1 AND singleton_key = ANY($2::text[]) AND state < 'active'`;
  const running = `SELECT singleton_key AS key FROM pgboss.job WHERE name = $1 AND state = 'active' AND singleton_key = ANY($2::text[])`;
  const rows = await sequelize.query<{ key: string }>(waitingOnly ? waiting : `${waiting} UNION ${running}`, {
    bind: [queue, keys],
    type: QueryTypes.SELECT,
    transaction,
  });
  return new Set(rows.map((r) => r.key));
}

/**
 * The state of the newest job carrying this singleton key (null when there is none, or it was
 * deleted by retention): how a message without a ledger row yet is doing (queued, or failed for good).
 */
export async function newestJobState(queue: string, key: string): Promise<string | null> {
  const rows = await sequelize.query<{ state: string }>(
    'SELECT state::text AS state FROM pgboss.job WHERE name = $1 AND singleton_key = $2 ORDER BY created_on DESC LIMIT 1',
    { bind: [queue, key], type: QueryTypes.SELECT },
  );
  return rows[0]?.state ?? null;
}
