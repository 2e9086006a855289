import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { stockLineSchema, stockSummarySchema } from '@/lib/api/dto/brewing';
import type { Actor } from '@/lib/auth';
import type { BatchStatus } from '@/models/Batch';
import { stockPicture, type StockPictureParams, type StockPictureRow } from './queries';
import { numericOrNull } from '@/lib/units/quantity';

// Chemical stock: what the lots hold, what batches under way have committed, what the next
// planned batch needs, and the summary the supplies page, the planner and the overview show.

/** Stock of one chemical: what the lots hold, what batches under way will take, what is free. */
export type StockLine = z.infer<typeof stockLineSchema>;

export type StockSummary = z.infer<typeof stockSummarySchema>;

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
export interface HeldLot {
  id: number;
  kind: 'methanol' | 'KOH' | 'NaOH';
  receivedAtMs: number;
  quantity: number;
  remaining: number;
  totalCostCents: number;
  purityPct: number | null;
}

/** What batches under way have committed of each chemical, and the next planned batch with its needs. */
export interface BatchNeeds {
  committed: Record<'methanol' | 'KOH' | 'NaOH', number>;
  next: {
    id: number;
    number: number;
    catalyst: 'KOH' | 'NaOH';
    methanolLiters: number;
    catalystGrams: number;
    batchDate: string;
    oilLiters: number;
  } | null;
}

/**
 * The lots holding methanol, KOH or NaOH (FIFO order, from the partial index on lots with
 * remaining stock) and the batches' needs: what batches under way have committed (summed per
 * catalyst) and the next planned batch (earliest date, then number) — one statement.
 * With `totals`, one summed "lot" per chemical (negative id, no date or purity) instead of every
 * lot, for summaries that need totals only (the overview, the low-stock check).
 */
export async function stockState(
  coopId: number,
  transaction?: Transaction,
  { totals = false } = {},
): Promise<{ lots: HeldLot[]; needs: BatchNeeds }> {
  return stockStateOf(await stockPicture(stockPictureParams(coopId, { totals }), transaction));
}

/** What stockState binds: the chemicals followed and the batch steps whose chemicals are committed. */
export function stockPictureParams(coopId: number, { totals = false } = {}): StockPictureParams {
  return { coopId, kinds: STOCKED, underWay: UNDER_WAY, totals };
}

/** The lots and the batches' needs from a stock picture row (lib/supplies/queries STOCK_PICTURE_COLUMNS). */
export function stockStateOf(row: StockPictureRow): { lots: HeldLot[]; needs: BatchNeeds } {
  const lots = row.lots.map((r) => ({
    id: r.id,
    kind: r.kind,
    receivedAtMs: r.receivedOn === null ? 0 : Date.parse(r.receivedOn),
    quantity: Number(r.quantity),
    remaining: Number(r.remaining),
    totalCostCents: Number(r.totalCostCents),
    purityPct: numericOrNull(r.purityPct),
  }));
  const needs: BatchNeeds = { committed: { methanol: 0, KOH: 0, NaOH: 0 }, next: null };
  for (const r of row.committed) {
    needs.committed.methanol += Number(r.methanolLiters ?? 0);
    needs.committed[r.catalyst] += Number(r.catalystGrams ?? 0);
  }
  needs.committed.methanol = Number(needs.committed.methanol.toFixed(3));
  const next = row.next;
  if (next) {
    needs.next = {
      id: next.id,
      number: next.number,
      catalyst: next.catalyst,
      methanolLiters: Number(next.methanolLiters),
      catalystGrams: Number(next.catalystGrams),
      batchDate: next.batchDate,
      oilLiters: Number(next.oilLiters),
    };
  }
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
    return {
      kind,
      unit,
      onHand,
      committed,
      available,
      lotsWithStock: mine.length,
      nextPlannedNeed: need,
      low: need !== null && available < need,
    };
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
