import 'server-only';
import type { Transaction } from 'sequelize';
import { sequelize } from '@/models';

/**
 * The statements of batches that a model call can't say. Every value is bound ($1, $2 …), never
 * spliced into the text.
 */

/** Advisory-lock key space of batch numbering (the first half of `pg_advisory_xact_lock(key, coopId)`). */
const BATCH_NUMBER_LOCK = 7301;

/**
 * Serialises numbering of a co-op's new batches until the transaction ends, so two batches created
 * at once can't take the same next number (max(number) + 1) — without locking the co-op row.
 */
export async function lockBatchNumbers(coopId: number, transaction: Transaction): Promise<void> {
  await sequelize.query('SELECT pg_advisory_xact_lock($1, $2)', { bind: [BATCH_NUMBER_LOCK, coopId], transaction });
}
