import 'server-only';
import { Op, type Transaction } from 'sequelize';
import { HttpError } from '@/lib/http';
import { BatchReview, MovementBatchShare, Tank, TankLayer } from '@/models';
import type { TankMixing } from '@/models/Tank';
import type { TankMovementKind } from '@/models/TankMovement';
import {
  addTo,
  allocateOutflow,
  allocateProportional,
  heldMl,
  sharesOf,
  takeFrom,
  type BatchShare,
  type Layer,
} from './lineage-math';
import { litersToMl, mlToLiters } from '@/lib/units/quantity';

export type { BatchShare, Layer, MixingModel } from './lineage-math';

/**
 * Where a ledger row's fuel comes from or which fuel it takes:
 * - `origin`: fuel of one origin enters (a release: its batch; an opening balance or a valued
 *   gain: null, unattributed);
 * - `shares`: exactly these batches enter or leave (a transfer in carries the transfer out's
 *   shares, a reversal the draw's, a disposal the held batch's layers);
 * - `model`: an outflow by the tank's mixing model (draws, transfers out) — refused when it would
 *   take held fuel;
 * - `spread`: an adjustment spread over every layer in proportion (a dip gain or loss).
 */
export type LineageSource =
  | { kind: 'origin'; batchId: number | null }
  | { kind: 'shares'; shares: BatchShare[] }
  | { kind: 'model' }
  | { kind: 'spread' };

/** The source a ledger row of this kind uses when its caller names none. */
export function defaultSource(
  kind: TankMovementKind,
  quantityMl: number,
  batchId: number | null,
  valued: boolean,
): LineageSource {
  if (kind === 'release') return { kind: 'origin', batchId };
  if (kind === 'draw' || kind === 'transfer-out') return { kind: 'model' };
  if (kind === 'dip-adjustment')
    return quantityMl > 0 && valued ? { kind: 'origin', batchId: null } : { kind: 'spread' };
  // Opening stock (imported) is fuel of no recorded batch; undoing it takes that fuel back out.
  if (kind === 'opening')
    return quantityMl > 0
      ? { kind: 'origin', batchId: null }
      : { kind: 'shares', shares: [{ batchId: null, ml: -quantityMl }] };
  throw new Error(`a '${kind}' ledger row must name the batches it moves`);
}

/** What a ledger row does to its tank's layers, computed before anything is written. */
export interface LineagePlan {
  coopId: number;
  tankId: number;
  before: Layer[];
  after: Layer[];
  /** Batches the row moved, each positive; the row's sign applies. */
  shares: BatchShare[];
  heldAfterMl: number;
}

async function loadLayers(t: Transaction, coopId: number, tankId: number): Promise<Layer[]> {
  const rows = await TankLayer.findAll({
    attributes: ['id', 'batchId', 'quantityLiters'],
    where: { coopId, tankId },
    order: [['id', 'ASC']],
    transaction: t,
    raw: true,
  });
  return rows.map((r) => ({ id: r.id, batchId: r.batchId, ml: litersToMl(r.quantityLiters) }));
}

async function heldBatchIds(t: Transaction, coopId: number, layers: Layer[]): Promise<Set<number>> {
  const ids = [...new Set(layers.map((l) => l.batchId).filter((b): b is number => b !== null))];
  if (ids.length === 0) return new Set();
  const open = await BatchReview.findAll({
    attributes: ['batchId'],
    where: { coopId, status: 'open', batchId: { [Op.in]: ids } },
    transaction: t,
    raw: true,
  });
  return new Set(open.map((r) => r.batchId));
}

const heldOf = (layers: Layer[], held: Set<number>, mixing: TankMixing) =>
  heldMl(layers, (b) => b !== null && held.has(b), mixing);

/**
 * Plans a ledger row's effect on the tank's layers (the tank row is already locked by the
 * caller). Outflows by the mixing model may not take held fuel (409); exact shares must be in
 * the tank. Nothing is written here: {@link writeLineage} does that once the row has its id.
 */
export async function planLineage(
  t: Transaction,
  p: {
    coopId: number;
    tankId: number;
    mixing: TankMixing;
    onHandMl: number;
    quantityMl: number;
    source: LineageSource;
  },
): Promise<LineagePlan> {
  const before = await loadLayers(t, p.coopId, p.tankId);
  const layered = before.reduce((a, l) => a + l.ml, 0);
  if (layered !== p.onHandMl) throw new Error(`tank ${p.tankId}: layers hold ${layered} mL, on hand ${p.onHandMl} mL`);
  const held = await heldBatchIds(t, p.coopId, before);
  const q = Math.abs(p.quantityMl);
  let after: Layer[];
  let shares: BatchShare[];
  const s = p.source;
  if (s.kind === 'origin') {
    if (p.quantityMl < 0) throw new Error('an origin brings fuel in');
    shares = [{ batchId: s.batchId, ml: q }];
    after = addTo(before, shares, p.mixing);
  } else if (s.kind === 'shares') {
    const sum = s.shares.reduce((a, x) => a + x.ml, 0);
    if (sum !== q || s.shares.some((x) => !Number.isInteger(x.ml) || x.ml <= 0))
      throw new Error(`shares sum to ${sum} mL, not ${q} mL`);
    shares = s.shares.map((x) => ({ ...x }));
    if (p.quantityMl > 0) after = addTo(before, shares, p.mixing);
    else {
      // Take exactly these batches, oldest layers of each first.
      const taken = before.map(() => 0);
      for (const x of shares) {
        let left = x.ml;
        before.forEach((l, i) => {
          if (l.batchId !== x.batchId || left === 0) return;
          const take = Math.min(l.ml - taken[i]!, left);
          taken[i]! += take;
          left -= take;
        });
        if (left > 0) throw new HttpError(409, 'The tank no longer holds that much of this batch.');
      }
      after = takeFrom(before, taken);
    }
  } else if (s.kind === 'model') {
    if (p.quantityMl > 0) throw new Error('the mixing model decides outflows only');
    const heldNow = heldOf(before, held, p.mixing);
    if (heldNow > 0 && q > layered - heldNow) {
      throw new HttpError(
        409,
        `${mlToLiters(heldNow)} L of this tank's fuel is held while a batch in it is under review.`,
        { quantity: ['Held fuel cannot be drawn or moved.'] },
        {
          heldLiters: heldNow / 1000,
        },
      );
    }
    const taken = allocateOutflow(before, q, p.mixing);
    shares = sharesOf(before, taken);
    after = takeFrom(before, taken);
  } else if (p.quantityMl < 0) {
    const taken = allocateProportional(
      before.map((l) => l.ml),
      q,
    );
    shares = sharesOf(before, taken);
    after = takeFrom(before, taken);
  } else if (layered === 0) {
    shares = [{ batchId: null, ml: q }];
    after = addTo(before, shares, p.mixing);
  } else {
    const added = allocateProportional(
      before.map((l) => l.ml),
      q,
    );
    shares = sharesOf(before, added);
    after = before.map((l, i) => ({ ...l, ml: l.ml + added[i]! }));
  }
  return { coopId: p.coopId, tankId: p.tankId, before, after, shares, heldAfterMl: heldOf(after, held, p.mixing) };
}

/**
 * Writes a planned change: layers created, updated or (emptied) deleted, and one share row per
 * batch for the ledger row, signed like it. The deferred constraint triggers check at commit
 * that the layers sum to on hand and a draw's shares to the draw.
 */
export async function writeLineage(
  t: Transaction,
  plan: LineagePlan,
  row: { movementId: string; drawId: number | null; sign: 1 | -1 },
): Promise<void> {
  const { coopId, tankId } = plan;
  const was = new Map(plan.before.map((l) => [l.id, l.ml]));
  for (const l of plan.after) {
    if (l.id === null) {
      if (l.ml > 0)
        await TankLayer.create(
          { coopId, tankId, batchId: l.batchId, quantityLiters: mlToLiters(l.ml) },
          { transaction: t },
        );
    } else if (l.ml === 0) {
      await TankLayer.destroy({ where: { id: l.id, coopId, tankId }, transaction: t });
    } else if (was.get(l.id) !== l.ml) {
      await TankLayer.update(
        { quantityLiters: mlToLiters(l.ml) },
        { where: { id: l.id, coopId, tankId }, transaction: t },
      );
    }
  }
  await MovementBatchShare.bulkCreate(
    plan.shares.map((s) => ({
      coopId,
      tankId,
      movementId: row.movementId,
      drawId: row.drawId,
      batchId: s.batchId,
      quantityLiters: mlToLiters(row.sign * s.ml),
    })),
    { transaction: t },
  );
}

/**
 * Recomputes a tank's held fuel after a review opened or closed or its mixing model changed
 * (locks the tank row). Returns the held millilitres.
 */
export async function refreshHeld(t: Transaction, coopId: number, tankId: number): Promise<number> {
  const tank = await Tank.findOne({
    attributes: ['mixing'],
    where: { id: tankId, coopId },
    lock: t.LOCK.UPDATE,
    transaction: t,
    raw: true,
  });
  if (!tank) return 0;
  const layers = await loadLayers(t, coopId, tankId);
  const held = heldOf(layers, await heldBatchIds(t, coopId, layers), tank.mixing);
  await Tank.update({ heldLiters: mlToLiters(held) }, { where: { id: tankId, coopId }, transaction: t });
  return held;
}

/** A draw's batch shares (positive millilitres), for its reversal. */
export async function drawShares(t: Transaction, coopId: number, drawId: number): Promise<BatchShare[]> {
  const rows = await MovementBatchShare.findAll({
    attributes: ['batchId', 'quantityLiters'],
    where: { coopId, drawId },
    order: [['id', 'ASC']],
    transaction: t,
    raw: true,
  });
  return rows.map((r) => ({ batchId: r.batchId, ml: Math.abs(litersToMl(r.quantityLiters)) }));
}
