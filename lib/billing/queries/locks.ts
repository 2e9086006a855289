import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';

/** Advisory-lock namespace for a co-op's money writes (any constant that no other module uses). */
const BILLING_LOCK_NAMESPACE = 73_051;

/**
 * Takes the co-op's billing advisory lock until the transaction ends (`pg_advisory_xact_lock`):
 * a model call cannot say it.
 */
export async function advisoryLockCoopBilling(t: Transaction, coopId: number): Promise<void> {
  await sequelize.query('SELECT pg_advisory_xact_lock($1::int, $2::int)', { bind: [BILLING_LOCK_NAMESPACE, coopId], type: QueryTypes.SELECT, transaction: t });
}

/**
 * The first instant of a month and of the next one in a time zone, as PostgreSQL's time-zone
 * rules compute them (the same rules the closed-month triggers use).
 * @param periodDate 'YYYY-MM-01'
 */
export async function monthInstants(periodDate: string, timeZone: string, t?: Transaction): Promise<{ start: Date; end: Date }> {
  const row = await sequelize.query<{ start: Date; end: Date }>(
    `SELECT ($1::date)::timestamp AT TIME ZONE $2 AS start, (($1::date + interval '1 month')::timestamp) AT TIME ZONE $2 AS "end"`,
    { bind: [periodDate, timeZone], type: QueryTypes.SELECT, plain: true, transaction: t },
  );
  return { start: new Date(row!.start), end: new Date(row!.end) };
}
