import 'server-only';
import type { stockLineSchema, stockSummarySchema } from '@/lib/api/dto/brewing';
import type { z } from 'zod';
import { col, fn, literal, Op, type InferAttributes, type Transaction } from 'sequelize';
import type { Actor } from '@/lib/auth';
import { Batch, ChemicalLot } from '@/models';
import type { BatchStatus } from '@/models/Batch';

// Chemical stock: what the lots hold, what batches under way have committed, what the next
// planned batch needs, and the summary the supplies page, the planner and the overview show.

/** Stock of one chemical: what the lots hold, what batches under way will take, what is free. */
export type StockLine = z.infer<typeof stockLineSchema>;

export type StockSummary = z.infer<typeof stockSummarySchema>;

/** How much of each batch's chemicals counts: what was actually used when recorded, else the plan. */
const NEED_METHANOL = 'COALESCE(actual_methanol_liters, computed_methanol_liters)';
const NEED_CATALYST = 'COALESCE(actual_catalyst_grams, computed_catalyst_grams)';
/** The chemicals the stock check follows (in the lots' units: L of methanol, g of catalyst). */
const STOCKED: HeldLot['kind'][] = ['methanol', 'KOH', 'NaOH'];
/** Batch steps between the start of the reaction and release: their chemicals are committed. */
const UNDER_WAY: BatchStatus[] = ['reacting', 'settling', 'draining', 'washing', 'drying', 'testing'];

/**
 * Stock on hand per chemical, what batches under way have committed, and the low-stock flag:
 * low when the available stock won't cover the next planned batch (the earliest in status
 * 'planned').
 */
export async function stockSummary(actor: Actor, transaction?: Transaction): Promise<StockSummary> {
  const { lots, needs } = await stockState(actor.coop.id, transaction);
  return summarizeStock(lots, needs);
}

/** A chemical lot that still holds stock. `receivedAtMs` is the day received (UTC midnight, ms), the FIFO key. */
export interface HeldLot { id: number; kind: 'methanol' | 'KOH' | 'NaOH'; receivedAtMs: number; quantity: number; remaining: number; totalCostCents: number; purityPct: number | null }

/**
 * The co-op's lots of methanol, KOH and NaOH that still hold stock, oldest first (FIFO order),
 * from the partial index on lots with remaining stock.
 */
export async function heldLots(coopId: number, transaction?: Transaction): Promise<HeldLot[]> {
  const rows = await ChemicalLot.findAll({
    attributes: ['id', 'kind', 'receivedOn', 'quantity', 'remainingQuantity', 'totalCostCents', 'purityPct'],
    where: { coopId, kind: STOCKED, remainingQuantity: { [Op.gt]: 0 } },
    order: [['receivedOn', 'ASC'], ['id', 'ASC']], raw: true, transaction,
  });
  return rows.map((r) => ({
    id: r.id, kind: r.kind as HeldLot['kind'], receivedAtMs: Date.parse(r.receivedOn), quantity: Number(r.quantity),
    remaining: Number(r.remainingQuantity), totalCostCents: Number(r.totalCostCents), purityPct: r.purityPct === null ? null : Number(r.purityPct),
  }));
}

/**
 * Stock on hand per chemical as one held "lot" per kind (summed in SQL), for summaries that need
 * totals only — e.g. the overview — instead of every lot with stock.
 */
export async function stockTotals(coopId: number, transaction?: Transaction): Promise<HeldLot[]> {
  const rows = (await ChemicalLot.findAll({
    attributes: ['kind', [fn('sum', col('remaining_quantity')), 'remaining'], [fn('sum', col('quantity')), 'quantity'], [fn('sum', col('total_cost_cents')), 'cost']],
    where: { coopId, kind: STOCKED, remainingQuantity: { [Op.gt]: 0 } },
    group: ['kind'], raw: true, transaction,
  })) as unknown as { kind: HeldLot['kind']; remaining: string; quantity: string; cost: string }[];
  return rows.map((r, i) => ({
    id: -(i + 1), kind: r.kind, receivedAtMs: 0, quantity: Number(r.quantity), remaining: Number(r.remaining),
    totalCostCents: Number(r.cost), purityPct: null,
  }));
}

/** What batches under way have committed of each chemical, and the next planned batch with its needs. */
export interface BatchNeeds {
  committed: Record<'methanol' | 'KOH' | 'NaOH', number>;
  next: { id: number; number: number; catalyst: 'KOH' | 'NaOH'; methanolLiters: number; catalystGrams: number; batchDate: string; oilLiters: number } | null;
}

type CommittedRow = Pick<InferAttributes<Batch>, 'catalyst'> & { methanolLiters: string | null; catalystGrams: string | null };
type NextPlannedRow = Pick<InferAttributes<Batch>, 'id' | 'number' | 'catalyst' | 'batchDate' | 'oilLiters'> & { methanolLiters: string; catalystGrams: string };

/**
 * What batches under way have committed of each chemical (summed per catalyst in SQL) and the next
 * planned batch (earliest date, then number) with what it needs, read in parallel.
 */
export async function batchNeeds(coopId: number, transaction?: Transaction): Promise<BatchNeeds> {
  const [committed, next] = await Promise.all([
    Batch.findAll({
      attributes: ['catalyst', [fn('sum', literal(NEED_METHANOL)), 'methanolLiters'], [fn('sum', literal(NEED_CATALYST)), 'catalystGrams']],
      where: { coopId, status: UNDER_WAY }, group: ['catalyst'], raw: true, transaction,
    }) as unknown as Promise<CommittedRow[]>,
    Batch.findOne({
      attributes: ['id', 'number', 'catalyst', 'batchDate', 'oilLiters', [literal(NEED_METHANOL), 'methanolLiters'], [literal(NEED_CATALYST), 'catalystGrams']],
      where: { coopId, status: 'planned' }, order: [['batchDate', 'ASC'], ['number', 'ASC']], raw: true, transaction,
    }) as unknown as Promise<NextPlannedRow | null>,
  ]);
  const out: BatchNeeds = { committed: { methanol: 0, KOH: 0, NaOH: 0 }, next: null };
  for (const r of committed) {
    out.committed.methanol += Number(r.methanolLiters ?? 0);
    out.committed[r.catalyst] += Number(r.catalystGrams ?? 0);
  }
  out.committed.methanol = Number(out.committed.methanol.toFixed(3));
  if (next) {
    out.next = {
      id: next.id, number: next.number, catalyst: next.catalyst, methanolLiters: Number(next.methanolLiters),
      catalystGrams: Number(next.catalystGrams), batchDate: next.batchDate, oilLiters: Number(next.oilLiters),
    };
  }
  return out;
}

/** The lots holding methanol, KOH or NaOH (FIFO order) and the batches' needs, read in parallel. */
export async function stockState(coopId: number, transaction?: Transaction): Promise<{ lots: HeldLot[]; needs: BatchNeeds }> {
  const [lots, needs] = await Promise.all([heldLots(coopId, transaction), batchNeeds(coopId, transaction)]);
  return { lots, needs };
}

/** Stock lines from the lots holding stock and the batches' needs (pure). */
export function summarizeStock(lots: HeldLot[], needs: BatchNeeds): StockSummary {
  const next = needs.next;
  const line = (kind: StockLine['kind'], unit: 'L' | 'g', need: number | null): StockLine => {
    const mine = lots.filter((l) => l.kind === kind);
    const onHand = Number(mine.reduce((a, l) => a + l.remaining, 0).toFixed(3));
    const committed = needs.committed[kind];
    const available = Number((onHand - committed).toFixed(3));
    return { kind, unit, onHand, committed, available, lotsWithStock: mine.length, nextPlannedNeed: need, low: need !== null && available < need };
  };
  return {
    nextPlannedBatch: next ? { id: next.id, number: next.number, catalyst: next.catalyst } : null,
    lines: [
      line('methanol', 'L', next ? next.methanolLiters : null),
      line('KOH', 'g', next?.catalyst === 'KOH' ? next.catalystGrams : null),
      line('NaOH', 'g', next?.catalyst === 'NaOH' ? next.catalystGrams : null),
    ],
  };
}

