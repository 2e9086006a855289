import 'server-only';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import type { LowStockAlert, LowStockChemical } from '@/models/LowStockAlert';

/**
 * The statements of supplies that a model call can't say. Every value is bound ($1, $2 …), never
 * spliced into the text.
 */

/**
 * Flips one chemical's low-stock state to 'low' unless it already is (an upsert guarded on the
 * row: `… DO UPDATE … WHERE state <> 'low' RETURNING`), so of concurrent callers exactly one sees
 * the crossing and sends the e-mail.
 * @returns true when this call made the crossing
 */
export async function flipLowStockToLow(coopId: number, chemical: LowStockChemical): Promise<boolean> {
  const rows = await sequelize.query<Pick<LowStockAlert, 'chemical'>>(
    `INSERT INTO low_stock_alerts (coop_id, chemical, state, changed_at, last_sent_at) VALUES ($1, $2, 'low', now(), now())
     ON CONFLICT (coop_id, chemical) DO UPDATE SET state = 'low', changed_at = now(), last_sent_at = now()
     WHERE low_stock_alerts.state <> 'low' RETURNING chemical`,
    { bind: [coopId, chemical], type: QueryTypes.SELECT },
  );
  return rows.length > 0;
}
