import 'server-only';
import { QueryTypes } from 'sequelize';
import { appUrl, sendMail } from '@/lib/mail';
import { formatVolume, type UnitSystem } from '@/lib/units';
import { sequelize } from '@/models';
import { stockState, summarizeStock, type StockLine } from './index';

const q = <T extends object>(sql: string, replacements: Record<string, unknown>) => sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });

function amount(line: Pick<StockLine, 'kind'>, value: number, units: UnitSystem): string {
  if (line.kind === 'methanol') return formatVolume(value, units, 1);
  return value >= 1000 ? `${(value / 1000).toLocaleString('en-US', { maximumFractionDigits: 2 })} kg` : `${Math.round(value).toLocaleString('en-US')} g`;
}

/**
 * Re-checks methanol and catalyst stock against the next planned batch and e-mails the co-op's
 * active brewers (brewers only — admins and treasurers are not brewing) once per crossing: the
 * flip of a chemical's state to 'low' is a guarded upsert (…WHERE state <> 'low' RETURNING), so of
 * concurrent requests only one sends; the state goes back to 'ok' when stock covers the need again
 * (or no batch is planned), and only a new crossing sends again.
 * Call it after a write that changes stock or the planned batches has committed; it never throws
 * (an alert must not fail the write that triggered it).
 * @returns the chemicals that crossed into 'low' on this call (e-mailed)
 */
export async function checkLowStock(coopId: number): Promise<StockLine['kind'][]> {
  try {
    const { lots, needs } = await stockState(coopId);
    const summary = summarizeStock(lots, needs);
    const crossed: StockLine[] = [];
    for (const line of summary.lines) {
      if (line.low) {
        const flipped = await q<{ chemical: string }>(
          `INSERT INTO low_stock_alerts (coop_id, chemical, state, changed_at, last_sent_at) VALUES (:c, :k, 'low', now(), now())
           ON CONFLICT (coop_id, chemical) DO UPDATE SET state = 'low', changed_at = now(), last_sent_at = now()
           WHERE low_stock_alerts.state <> 'low' RETURNING chemical`,
          { c: coopId, k: line.kind },
        );
        if (flipped.length) crossed.push(line);
      } else {
        await sequelize.query(`UPDATE low_stock_alerts SET state = 'ok', changed_at = now() WHERE coop_id = :c AND chemical = :k AND state <> 'ok'`, {
          replacements: { c: coopId, k: line.kind },
        });
      }
    }
    if (!crossed.length || !summary.nextPlannedBatch) return crossed.map((l) => l.kind);
    const [coop] = await q<{ name: string; slug: string; units: UnitSystem }>('SELECT name, slug, units FROM coops WHERE id = :c', { c: coopId });
    const brewers = await q<{ email: string; name: string }>(
      `SELECT u.email, u.name FROM memberships m JOIN users u ON u.id = m.user_id
       WHERE m.coop_id = :c AND m.role = 'brewer' AND m.status = 'active' ORDER BY u.id`,
      { c: coopId },
    );
    if (!coop) return crossed.map((l) => l.kind);
    const lines = crossed.map((l) =>
      `- ${l.kind}: ${amount(l, Math.max(l.available, 0), coop.units)} available (${amount(l, l.onHand, coop.units)} on hand, ${amount(l, l.committed, coop.units)} in batches under way); batch ${summary.nextPlannedBatch!.number} needs ${amount(l, l.nextPlannedNeed ?? 0, coop.units)}.`,
    );
    const text = [
      `Stock at ${coop.name} won't cover the next planned batch (batch ${summary.nextPlannedBatch.number}):`,
      '',
      ...lines,
      '',
      `Order more or change the plan: ${appUrl(`/c/${coop.slug}/supplies`)}`,
      '',
      'You will get this e-mail again only after the stock has covered the next batch and then fallen short again.',
      'Store methanol and catalyst as your supplier\'s safety data sheets and your local fire code require.',
    ].join('\n');
    const subject = `${coop.name}: low ${crossed.map((l) => l.kind).join(' and ')} for batch ${summary.nextPlannedBatch.number}`;
    await Promise.all(brewers.map((b) => sendMail({ to: b.email, subject, text })));
    return crossed.map((l) => l.kind);
  } catch (e) {
    console.error('[low-stock] check failed:', (e as Error).message);
    return [];
  }
}
