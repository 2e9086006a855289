import 'server-only';
import { Op } from 'sequelize';
import { enqueueMany, QUEUES, type PlainMailJob } from '@/lib/jobs';
import { appUrl } from '@/lib/mail';
import { formatVolume, type UnitSystem } from '@/lib/units';
import { Coop, LowStockAlert, Membership, User } from '@/models';
import { stockState, summarizeStock, type StockLine } from './stock';
import { flipLowStockToLow } from './queries';

function amount(line: Pick<StockLine, 'kind'>, value: number, units: UnitSystem): string {
  if (line.kind === 'methanol') return formatVolume(value, units, 1);
  return value >= 1000
    ? `${(value / 1000).toLocaleString('en-US', { maximumFractionDigits: 2 })} kg`
    : `${Math.round(value).toLocaleString('en-US')} g`;
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
        if (await flipLowStockToLow(coopId, line.kind)) crossed.push(line);
      } else {
        await LowStockAlert.update(
          { state: 'ok', changedAt: new Date() },
          { where: { coopId, chemical: line.kind, state: { [Op.ne]: 'ok' } } },
        );
      }
    }
    if (!crossed.length || !summary.nextPlannedBatch) return crossed.map((l) => l.kind);
    const [coop, brewers] = await Promise.all([
      Coop.findByPk(coopId, { attributes: ['name', 'slug', 'units'], raw: true }),
      // The co-op's active brewers with their e-mail (one query, the user joined in).
      Membership.findAll({
        attributes: [],
        where: { coopId, role: 'brewer', status: 'active' },
        include: [{ model: User, as: 'user', attributes: ['email', 'name'], required: true }],
        order: [[{ model: User, as: 'user' }, 'id', 'ASC']],
      }).then((rows) => rows.map((m) => ({ email: m.user!.email, name: m.user!.name }))),
    ]);
    if (!coop) return crossed.map((l) => l.kind);
    const lines = crossed.map(
      (l) =>
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
      "Store methanol and catalyst as your supplier's safety data sheets and your local fire code require.",
    ].join('\n');
    const subject = `${coop.name}: low ${crossed.map((l) => l.kind).join(' and ')} for batch ${summary.nextPlannedBatch.number}`;
    // One mail job per brewer: the worker sends them, retrying while the mail server is down.
    await enqueueMany<PlainMailJob>(
      QUEUES.mail,
      brewers.map((b) => ({ to: b.email, subject, text, record: { kind: 'none' } })),
    );
    return crossed.map((l) => l.kind);
  } catch (e) {
    console.error('[low-stock] check failed:', (e as Error).message);
    return [];
  }
}
