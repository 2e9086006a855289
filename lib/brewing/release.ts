import 'server-only';
import { checkLowStock } from '@/lib/supplies/low-stock';
import { Op, type InferAttributes, type InferCreationAttributes, type Transaction } from 'sequelize';
import { audit } from '@/lib/audit';
import type { Actor } from '@/lib/auth';
import { batchCost, consumeFifo, type FifoLotByTotal } from '@/lib/costing';
import { conflict, HttpError, invalidFields } from '@/lib/http';
import { recordMovement } from '@/lib/tank/ledger';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';
import { formatVolume, litersToGallons, volumeToLiters } from '@/lib/units';
import { inTransaction } from '@/lib/db';
import { Batch, ChemicalConsumption, ChemicalLot, Tank } from '@/models';
import { batchOilLotShares, energyCentsOf, feedstockShareCents, getBatch, type BatchDto } from './read';
import { labResultsOf, loadBrewedBatch, type BatchRecord, type BrewedBatch } from './stored';
import { evaluateQuality } from '@/lib/quality';

type BatchCreation = InferCreationAttributes<Batch>;
type LotRow = Pick<
  InferAttributes<ChemicalLot>,
  'id' | 'receivedOn' | 'quantity' | 'remainingQuantity' | 'totalCostCents'
>;

/** One chemical the batch used, in the lots' unit (L of methanol, g of catalyst). */
interface Need {
  kind: 'methanol' | 'KOH' | 'NaOH';
  quantity: number;
  field: string;
  label: string;
  unit: 'L' | 'g';
}

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
      const page: LotRow[] = await ChemicalLot.findAll({
        attributes: ['id', 'receivedOn', 'quantity', 'remainingQuantity', 'totalCostCents'],
        where: {
          coopId,
          kind: need.kind,
          remainingQuantity: { [Op.gt]: 0 },
          // (received_on, id) after the last lot of the previous page
          ...(after
            ? {
                [Op.or]: [
                  { receivedOn: { [Op.gt]: after.receivedOn } },
                  { receivedOn: after.receivedOn, id: { [Op.gt]: after.id } },
                ],
              }
            : {}),
        },
        order: [
          ['receivedOn', 'ASC'],
          ['id', 'ASC'],
        ],
        limit: 50,
        lock: t.LOCK.UPDATE,
        raw: true,
        transaction: t,
      });
      if (page.length === 0) break;
      lots.push(...page);
      covered += page.reduce((a, l) => a + Number(l.remainingQuantity), 0);
      const last = page[page.length - 1]!;
      after = { receivedOn: last.receivedOn, id: last.id };
    }
    const fifoLots: FifoLotByTotal[] = lots.map((l) => ({
      id: l.id,
      receivedAt: l.receivedOn,
      qty: Number(l.quantity),
      remainingQty: Number(l.remainingQuantity),
      totalCostCents: Number(l.totalCostCents),
    }));
    const result = consumeFifo(fifoLots, qty);
    if (result.shortfallQty > 0 && !allowShortfall) {
      const short = need.unit === 'L' ? `${result.shortfallQty.toFixed(3)} L` : `${result.shortfallQty.toFixed(1)} g`;
      shortages[need.field] = [`Stock is short of ${need.label} by ${short}. Record the purchase in Supplies first.`];
    }
    plans.push({ need, result });
  }
  if (Object.keys(shortages).length)
    throw new HttpError(409, 'There is not enough in stock to cover this batch.', shortages);

  for (const { need, result } of plans) {
    const slices = result.allocations.filter((a) => a.qty > 0);
    await ChemicalConsumption.bulkCreate(
      slices.map((a) => ({
        coopId,
        batchId,
        chemicalLotId: Number(a.lotId),
        quantity: a.qty.toFixed(3),
        costCents: String(a.costCents),
      })),
      { transaction: t },
    );
    for (const a of slices) {
      await ChemicalLot.update(
        { remainingQuantity: a.remainingQtyAfter.toFixed(3) },
        { where: { id: Number(a.lotId), coopId }, transaction: t },
      );
    }
    out[need.kind] = { costCents: result.totalCostCents, shortfall: result.shortfallQty };
  }
  return out;
}

/** The chemicals a batch used: what was recorded as actually used, else the plan. */
function needsOf(row: BrewedBatch): Need[] {
  const methanol = Number(row.actualMethanolLiters ?? row.computedMethanolLiters);
  const catalyst = Number(row.actualCatalystGrams ?? row.computedCatalystGrams);
  return [
    { kind: 'methanol', quantity: methanol, field: 'actualMethanol', label: 'methanol', unit: 'L' },
    { kind: row.catalyst, quantity: catalyst, field: 'actualCatalystGrams', label: row.catalyst, unit: 'g' },
  ];
}

async function feedstockFromLots(t: Transaction, coopId: number, batchId: number): Promise<number> {
  const lots = await batchOilLotShares(coopId, batchId, t);
  return lots.reduce((a, l) => a + feedstockShareCents(Number(l.oilLot.costCents), l.liters, l.oilLot.volumeLiters), 0);
}

/** The batch's stored feedstock cost: the typed override, else its oil lots' shares. */
async function feedstockCentsOf(t: Transaction, coopId: number, row: BatchRecord): Promise<number> {
  return row.feedstockCentsOverride !== null
    ? Number(row.feedstockCentsOverride)
    : feedstockFromLots(t, coopId, row.id);
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
export async function releaseBatch(
  actor: Actor,
  id: number,
  input: { tankId: number; volume: number; reason?: string },
): Promise<BatchDto> {
  const coopId = actor.coop.id;
  const releasedMl = litersToMl(volumeToLiters(input.volume, actor.coop.units).toFixed(3));
  if (releasedMl <= 0) throw invalidFields({ volume: ['Volume released must be more than 0.'] });
  const releasedLiters = mlToLiters(releasedMl);
  await inTransaction(async (t) => {
    const row = await loadBrewedBatch(coopId, id, t, true);
    if (row.status === 'released' || row.status === 'rejected')
      throw conflict(`Batch ${row.number} is already ${row.status}.`);
    if (row.status !== 'testing')
      throw conflict(
        `Move batch ${row.number} to testing and record its quality checks before releasing it (it is at “${row.status}”).`,
      );
    // Releasing fuel that does not meet the standard in full is a deliberate act: it needs a written reason.
    const quality = evaluateQuality(row.qualityStandard, labResultsOf(row)).verdict;
    const reason = input.reason?.trim() ?? '';
    if (quality.kind !== 'meets' && reason.length < 3) {
      throw invalidFields({
        reason: [`${quality.text}. Say why this batch is released anyway (at least 3 characters).`],
      });
    }

    const tankBefore = await Tank.findOne({
      attributes: ['id'],
      where: { id: input.tankId, coopId, active: true },
      raw: true,
      transaction: t,
    });
    if (!tankBefore) throw invalidFields({ tankId: ['Choose one of the co-op’s active tanks.'] });

    const used = await consumeChemicals(t, coopId, id, needsOf(row), false);
    const methanolCents = used.methanol.costCents;
    const catalystCents = used[row.catalyst].costCents;
    const energyCents = energyCentsOf(row) ?? 0;
    const feedstockCents = await feedstockCentsOf(t, coopId, row);
    const otherCents = Number(row.otherCents);
    const cost = batchCost({
      chemicalsCents: methanolCents + catalystCents,
      energyCents,
      feedstockCents,
      otherCents,
      gallonsReleased: litersToGallons(Number(releasedLiters)),
    });

    // Locked after the chemical lots (batch → lots → tank, the same order for every release).
    const tank = await Tank.findOne({
      attributes: ['capacityLiters', 'onHandLiters'],
      where: { id: input.tankId, coopId },
      lock: t.LOCK.UPDATE,
      raw: true,
      transaction: t,
    });
    const roomMl = litersToMl(tank!.capacityLiters) - litersToMl(tank!.onHandLiters);
    if (releasedMl > roomMl) {
      throw invalidFields({
        volume: [`The tank has room for only ${formatVolume(Math.max(0, roomMl) / 1000, actor.coop.units, 1)}.`],
      });
    }
    await recordMovement(t, {
      coopId,
      tankId: input.tankId,
      kind: 'release',
      quantityMl: releasedMl,
      valueCents: cost.totalCents,
      batchId: id,
      userId: actor.user.id,
    });

    const after = {
      status: 'released',
      tankId: input.tankId,
      releasedLiters,
      costMethanolCents: methanolCents,
      costCatalystCents: catalystCents,
      costEnergyCents: energyCents,
      costFeedstockCents: feedstockCents,
      costOtherCents: otherCents,
      totalCostCents: cost.totalCents,
      costPerGallonCents: cost.costPerGallonCents,
      quality: quality.text,
      ...(reason ? { releaseReason: reason } : {}),
    };
    const now = new Date();
    await Batch.update(
      {
        status: 'released',
        statusChangedAt: now,
        releasedAt: now,
        tankId: input.tankId,
        releasedLiters: String(releasedLiters),
        costMethanolCents: String(methanolCents),
        costCatalystCents: String(catalystCents),
        costEnergyCents: String(energyCents),
        costFeedstockCents: String(feedstockCents),
        costOtherCents: String(otherCents),
        totalCostCents: String(cost.totalCents),
        costPerGallonCents: cost.costPerGallonCents === null ? null : String(cost.costPerGallonCents),
        ...(reason
          ? { notes: `${row.notes ? `${row.notes}\n\n` : ''}Released with quality “${quality.text}”: ${reason}` }
          : {}),
      },
      { where: { id, coopId }, transaction: t },
    );
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'batch.release',
        entityType: 'batch',
        entityId: id,
        before: { status: row.status },
        after,
      },
      t,
    );
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
  await inTransaction(async (t) => {
    const row = await loadBrewedBatch(coopId, id, t, true);
    if (row.status === 'released' || row.status === 'rejected')
      throw conflict(`Batch ${row.number} is already ${row.status}.`);
    // Once the reaction has started its chemicals are gone: they and the other costs stay on the batch.
    let costs: Partial<
      Pick<
        BatchCreation,
        | 'costMethanolCents'
        | 'costCatalystCents'
        | 'costEnergyCents'
        | 'costFeedstockCents'
        | 'costOtherCents'
        | 'totalCostCents'
      >
    > = {};
    if (row.status !== 'planned') {
      const used = await consumeChemicals(t, coopId, id, needsOf(row), true);
      const energy = energyCentsOf(row) ?? 0;
      const feedstock = await feedstockCentsOf(t, coopId, row);
      const other = Number(row.otherCents);
      const cost = batchCost({
        chemicalsCents: used.methanol.costCents + used[row.catalyst].costCents,
        energyCents: energy,
        feedstockCents: feedstock,
        otherCents: other,
        gallonsReleased: 0,
      });
      costs = {
        costMethanolCents: String(used.methanol.costCents),
        costCatalystCents: String(used[row.catalyst].costCents),
        costEnergyCents: String(energy),
        costFeedstockCents: String(feedstock),
        costOtherCents: String(other),
        totalCostCents: String(cost.totalCents),
      };
    }
    const now = new Date();
    await Batch.update(
      { status: 'rejected', statusChangedAt: now, rejectedAt: now, rejectReason: reason, ...costs },
      { where: { id, coopId }, transaction: t },
    );
    await audit(
      {
        coopId,
        actorUserId: actor.user.id,
        action: 'batch.reject',
        entityType: 'batch',
        entityId: id,
        before: { status: row.status },
        after: { status: 'rejected', reason, ...costs },
      },
      t,
    );
  });
  await checkLowStock(actor.coop.id);
  return getBatch(actor, id);
}
