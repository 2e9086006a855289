import 'server-only';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/lib/db';

/**
 * Takes the next id of draws' sequence. A draw's ledger row is written first (it decides the
 * cost value the draw stores), and names the draw by this id; the foreign key from the ledger to
 * draws is DEFERRABLE INITIALLY DEFERRED, so the draw row may follow within the transaction.
 */
export async function nextDrawId(transaction: Transaction): Promise<number> {
  const [row] = await sequelize.query<{ id: string }>(
    `SELECT nextval(pg_get_serial_sequence('draws', 'id'))::text AS id`,
    {
      type: QueryTypes.SELECT,
      transaction,
    },
  );
  return Number(row!.id);
}
