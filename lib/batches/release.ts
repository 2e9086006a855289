import 'server-only';
import { checkLowStock } from '@/lib/supplies/low-stock';
import { QueryTypes, type Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { batchCost, consumeFifo, type FifoLotByTotal } from '@/lib/costing';
import { conflict, HttpError } from '@/lib/http';
import { recordMovement } from '@/lib/tank/ledger';
import { litersToMl, mlToLiters } from '@/lib/tank/quantity';
import { formatVolume, litersToGallons, volumeToLiters } from '@/lib/units';
import { ChemicalConsumption, sequelize } from '@/models';
import { energyCentsOf, feedstockShareCents, getBatch, loadBatchRow, type BatchDto, type BatchRow } from './records';

interface LotRow { id: number; received_on: string; quantity: string; remaining_quantity: string; total_cost_cents: string }

/** One chemical the batch used, in the lots' unit (L of methanol, g of catalyst). */
interface Need { kind: 'methanol' | 'KOH' | 'NaOH'; quantity: number; field: string; label: string; unit: 'L' | 'g' }

/**
 * Takes what a batch used from the chemical lots, oldest first (lib/costing consumeFifo), and
 * writes it down: the lots are locked FOR UPDATE (in FIFO order, a page at a time until the need
 * is covered), a consumption row per lot slice is added, and each lot's remaining quantity drops.
 * With `allowShortfall` false a shortage is a 409 and nothing is written.
 * @returns cost in cents per chemical and any shortfall (in the lots' unit)
 */
export async function consumeChemicals(
  t: Transaction,
  coopId: number,
  batchId: number,
  needs: Need[],
  allowShortfall: boolean,
): Promise<Record<Need['kind'], { costCents: number; shortfall: number }>> {
  const out = {} as Record<Need['kind'], { costCents: number; shortfall: number }>;
  const shortages: Record<string, string[]> = {};
  const plans: { need: Need; result: ReturnType<typeof consumeFifo> }[] = [];
  for (const need of needs) {
    const qty = Math.round(need.quantity * 1000) / 1000;
    const lots: LotRow[] = [];
    let covered = 0;
    let after: { receivedOn: string; id: number } | null = null;
    while (covered < qty) {
      const page: LotRow[] = await sequelize.query<LotRow>(
        `SELECT id, received_on, quantity, remaining_quantity, total_cost_cents FROM chemical_lots
          WHERE coop_id = :coopId AND kind = :kind AND remaining_quantity > 0
            ${after ? 'AND (received_on, id) > (:afterDate, :afterId)' : ''}
          ORDER BY received_on, id LIMIT 50 FOR UPDATE`,
        { replacements: { coopId, kind: need.kind, afterDate: after?.receivedOn ?? null, afterId: after?.id ?? null }, type: QueryTypes.SELECT, transaction: t },
      );
      if (page.length === 0) break;
      lots.push(...page);
      covered += page.reduce((a, l) => a + Number(l.remaining_quantity), 0);
      const last = page[page.length - 1]!;
      after = { receivedOn: last.received_on, id: last.id };
    }
    const fifoLots: FifoLotByTotal[] = lots.map((l) => ({
      id: l.id, receivedAt: l.received_on, qty: Number(l.quantity), remainingQty: Number(l.remaining_quantity), totalCostCents: Number(l.total_cost_cents),
    }));
    const result = consumeFifo(fifoLots, qty);
    if (result.shortfallQty > 0 && !allowShortfall) {
      const short = need.unit === 'L' ? `${result.shortfallQty.toFixed(3)} L` : `${result.shortfallQty.toFixed(1)} g`;
      shortages[need.field] = [`Stock is short of ${need.label} by ${short}. Record the purchase in Supplies first.`];
    }
    plans.push({ need, result });
  }
  if (Object.keys(shortages).length) throw new HttpError(409, 'There is not enough in stock to cover this batch.', shortages);

  for (const { need, result } of plans) {
    for (const a of result.allocations) {
      if (a.qty <= 0) continue;
      await ChemicalConsumption.create(
        { coopId, batchId, chemicalLotId: Number(a.lotId), quantity: a.qty.toFixed(3), costCents: String(a.costCents) },
        { transaction: t },
      );
      await sequelize.query(`UPDATE chemical_lots SET remaining_quantity = :after, updated_at = now() WHERE id = :id AND coop_id = :coopId`, {
        replacements: { after: a.remainingQtyAfter.toFixed(3), id: a.lotId, coopId }, transaction: t,
      });
    }
    out[need.kind] = { costCents: result.totalCostCents, shortfall: result.shortfallQty };
  }
  return out;
}

/** The chemicals a batch used: what was recorded as actually used, else the plan. */
function needsOf(row: BatchRow): Need[] {
  const methanol = Number(row.actual_methanol_liters ?? row.computed_methanol_liters);
  const catalyst = Number(row.actual_catalyst_grams ?? row.computed_catalyst_grams);
  return [
    { kind: 'methanol', quantity: methanol, field: 'actualMethanol', label: 'methanol', unit: 'L' },
    { kind: row.catalyst, quantity: catalyst, field: 'actualCatalystGrams', label: row.catalyst, unit: 'g' },
  ];
}

async function feedstockFromLots(t: Transaction, coopId: number, batchId: number): Promise<number> {
  const lots = await sequelize.query<{ liters: string; cost_cents: string; volume_liters: string }>(
    `SELECT bol.liters, o.cost_cents, o.volume_liters FROM batch_oil_lots bol JOIN oil_lots o ON o.id = bol.oil_lot_id AND o.coop_id = bol.coop_id
      WHERE bol.batch_id = :batchId AND bol.coop_id = :coopId`,
    { replacements: { batchId, coopId }, type: QueryTypes.SELECT, transaction: t },
  );
  return lots.reduce((a, l) => a + feedstockShareCents(Number(l.cost_cents), l.liters, l.volume_liters), 0);
}

/**
 * Releases a tested batch into a tank, in one transaction: locks the batch, consumes the chemical
 * lots FIFO (409 when stock is short), prices the batch (methanol, catalyst, energy, feedstock,
 * other; lib/costing batchCost → cost per US gallon), checks the tank's room, records the tank
 * movement through lib/tank/ledger (the batch's total cost moves in with the fuel), and stores
 * the breakdown on the batch.
 * @param actor brewer or admin
 * @param id batch id (another co-op's → 404)
 * @param input tank and the volume released, typed in the co-op's units
 */
export async function releaseBatch(actor: Actor, id: number, input: { tankId: number; volume: number }): Promise<BatchDto> {
  const coopId = actor.coop.id;
  const releasedMl = litersToMl(volumeToLiters(input.volume, actor.coop.units).toFixed(3));
  if (releasedMl <= 0) throw new HttpError(422, 'Some fields need attention.', { volume: ['Volume released must be more than 0.'] });
  const releasedLiters = mlToLiters(releasedMl);
  await sequelize.transaction(async (t) => {
    const row = await loadBatchRow(coopId, id, t, true);
    if (row.status === 'released' || row.status === 'rejected') throw conflict(`Batch ${row.number} is already ${row.status}.`);
    if (row.status !== 'testing') throw conflict(`Move batch ${row.number} to testing and record its quality checks before releasing it (it is at “${row.status}”).`);

    const [tankBefore] = await sequelize.query<{ id: number }>(`SELECT id FROM tanks WHERE id = :tankId AND coop_id = :coopId AND active`, {
      replacements: { tankId: input.tankId, coopId }, type: QueryTypes.SELECT, transaction: t,
    });
    if (!tankBefore) throw new HttpError(422, 'Some fields need attention.', { tankId: ['Choose one of the co-op’s active tanks.'] });

    const used = await consumeChemicals(t, coopId, id, needsOf(row), false);
    const methanolCents = used.methanol.costCents;
    const catalystCents = used[row.catalyst].costCents;
    const energyCents = energyCentsOf(row) ?? 0;
    const feedstockCents = row.feedstock_cents_override !== null ? Number(row.feedstock_cents_override) : await feedstockFromLots(t, coopId, id);
    const otherCents = Number(row.other_cents);
    const cost = batchCost({
      chemicalsCents: methanolCents + catalystCents, energyCents, feedstockCents, otherCents,
      gallonsReleased: litersToGallons(Number(releasedLiters)),
    });

    // Locked after the chemical lots (batch → lots → tank, the same order for every release).
    const [tank] = await sequelize.query<{ capacity_liters: string; on_hand_liters: string }>(
      `SELECT capacity_liters, on_hand_liters FROM tanks WHERE id = :tankId AND coop_id = :coopId FOR UPDATE`,
      { replacements: { tankId: input.tankId, coopId }, type: QueryTypes.SELECT, transaction: t },
    );
    const roomMl = litersToMl(tank!.capacity_liters) - litersToMl(tank!.on_hand_liters);
    if (releasedMl > roomMl) {
      throw new HttpError(422, 'Some fields need attention.', {
        volume: [`The tank has room for only ${formatVolume(Math.max(0, roomMl) / 1000, actor.coop.units, 1)}.`],
      });
    }
    await recordMovement(t, { coopId, tankId: input.tankId, kind: 'release', quantityMl: releasedMl, valueCents: cost.totalCents, batchId: id, userId: actor.user.id });

    const after = {
      status: 'released', tankId: input.tankId, releasedLiters, costMethanolCents: methanolCents, costCatalystCents: catalystCents,
      costEnergyCents: energyCents, costFeedstockCents: feedstockCents, costOtherCents: otherCents, totalCostCents: cost.totalCents,
      costPerGallonCents: cost.costPerGallonCents,
    };
    await sequelize.query(
      `UPDATE batches SET status = 'released', status_changed_at = now(), released_at = now(), tank_id = :tankId, released_liters = :releasedLiters,
              cost_methanol_cents = :methanol, cost_catalyst_cents = :catalyst, cost_energy_cents = :energy, cost_feedstock_cents = :feedstock,
              cost_other_cents = :other, total_cost_cents = :total, cost_per_gallon_cents = :perGallon, updated_at = now()
        WHERE id = :id AND coop_id = :coopId`,
      {
        replacements: {
          tankId: input.tankId, releasedLiters, methanol: methanolCents, catalyst: catalystCents, energy: energyCents, feedstock: feedstockCents,
          other: otherCents, total: cost.totalCents, perGallon: cost.costPerGallonCents, id, coopId,
        },
        transaction: t,
      },
    );
    await audit({ coopId, actorUserId: actor.user.id, action: 'batch.release', entityType: 'batch', entityId: id, before: { status: row.status }, after }, t);
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}

/**
 * Rejects a batch with a reason. Once the reaction has started its chemicals are gone, so they
 * are taken from the lots FIFO as far as stock goes and the batch keeps its costs (no fuel
 * reaches a tank, so there is no cost per gallon). Final batches → 409.
 */
export async function rejectBatch(actor: Actor, id: number, reason: string): Promise<BatchDto> {
  const coopId = actor.coop.id;
  await sequelize.transaction(async (t) => {
    const row = await loadBatchRow(coopId, id, t, true);
    if (row.status === 'released' || row.status === 'rejected') throw conflict(`Batch ${row.number} is already ${row.status}.`);
    let costs: Record<string, number | null> = {};
    if (row.status !== 'planned') {
      const used = await consumeChemicals(t, coopId, id, needsOf(row), true);
      const energy = energyCentsOf(row) ?? 0;
      const feedstock = row.feedstock_cents_override !== null ? Number(row.feedstock_cents_override) : await feedstockFromLots(t, coopId, id);
      const cost = batchCost({ chemicalsCents: used.methanol.costCents + used[row.catalyst].costCents, energyCents: energy, feedstockCents: feedstock, otherCents: Number(row.other_cents), gallonsReleased: 0 });
      costs = {
        cost_methanol_cents: used.methanol.costCents, cost_catalyst_cents: used[row.catalyst].costCents, cost_energy_cents: energy,
        cost_feedstock_cents: feedstock, cost_other_cents: Number(row.other_cents), total_cost_cents: cost.totalCents,
      };
    }
    const sets = Object.keys(costs).map((k) => `${k} = :${k}`).join(', ');
    await sequelize.query(
      `UPDATE batches SET status = 'rejected', status_changed_at = now(), rejected_at = now(), reject_reason = :reason${sets ? `, ${sets}` : ''}, updated_at = now()
        WHERE id = :id AND coop_id = :coopId`,
      { replacements: { reason, id, coopId, ...costs }, transaction: t },
    );
    await audit({ coopId, actorUserId: actor.user.id, action: 'batch.reject', entityType: 'batch', entityId: id, before: { status: row.status }, after: { status: 'rejected', reason, ...costs } }, t);
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}
