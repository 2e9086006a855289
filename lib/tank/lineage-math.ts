// Pure lineage arithmetic (no I/O): how a tank's batch layers change when fuel enters or leaves.
// Quantities are whole millilitres (lib/units/quantity), so every share is exact and the shares of
// a movement sum to the movement exactly.

/** 'mixed': every draw takes each batch in proportion; 'fifo': the oldest fuel leaves first. */
export type MixingModel = 'mixed' | 'fifo';

/** One layer of a tank, oldest first. `batchId` null = unattributed fuel (e.g. an opening balance). */
export interface Layer {
  /** Database id, or null for a layer not stored yet. */
  id: number | null;
  batchId: number | null;
  ml: number;
}

/** How much of one batch a movement carried (positive: the amount; the sign is the movement's). */
export interface BatchShare {
  batchId: number | null;
  ml: number;
}

/**
 * Splits `takeMl` over `weights` in proportion, exactly: each part is floor(w × take ÷ total),
 * and the millilitres left over go one each to the largest remainders, ties to the earlier
 * entry (the oldest layer). The parts sum to `takeMl`. BigInt keeps w × take exact past 2^53.
 */
export function allocateProportional(weights: readonly number[], takeMl: number): number[] {
  const total = weights.reduce((a, w) => a + w, 0);
  if (takeMl < 0 || takeMl > total) throw new RangeError(`cannot take ${takeMl} mL from ${total} mL`);
  if (takeMl === 0) return weights.map(() => 0);
  const T = BigInt(total);
  const parts = weights.map((w) => {
    const p = BigInt(w) * BigInt(takeMl);
    return { q: Number(p / T), r: p % T };
  });
  let left = takeMl - parts.reduce((a, p) => a + p.q, 0);
  const order = parts.map((p, i) => ({ i, r: p.r })).sort((a, b) => (a.r === b.r ? a.i - b.i : a.r > b.r ? -1 : 1));
  const out = parts.map((p) => p.q);
  for (const { i } of order) {
    if (left === 0) break;
    out[i]! += 1;
    left -= 1;
  }
  return out;
}

/** First in, first out: takes `takeMl` from the oldest layers first. */
export function allocateFifo(weights: readonly number[], takeMl: number): number[] {
  let left = takeMl;
  const out = weights.map((w) => {
    const q = Math.min(w, left);
    left -= q;
    return q;
  });
  if (left > 0) throw new RangeError(`cannot take ${takeMl} mL from ${takeMl - left} mL`);
  return out;
}

/** Shares taken from each layer, merged by batch in layer order (zero shares left out). */
export function sharesOf(layers: readonly Layer[], taken: readonly number[]): BatchShare[] {
  const out: BatchShare[] = [];
  layers.forEach((l, i) => {
    const q = taken[i] ?? 0;
    if (q === 0) return;
    const same = out.find((s) => s.batchId === l.batchId);
    if (same) same.ml += q;
    else out.push({ batchId: l.batchId, ml: q });
  });
  return out;
}

/** Layers after taking `taken[i]` from each (emptied layers keep ml 0; the caller deletes them). */
export function takeFrom(layers: readonly Layer[], taken: readonly number[]): Layer[] {
  return layers.map((l, i) => ({ ...l, ml: l.ml - (taken[i] ?? 0) }));
}

/**
 * Layers after fuel of known batches comes in. A well-mixed tank keeps one layer per batch (fuel
 * of a batch already there joins it); a first-in-first-out tank stacks new fuel on top, joining
 * the newest layer only when it is the same batch.
 */
export function addTo(layers: readonly Layer[], shares: readonly BatchShare[], model: MixingModel): Layer[] {
  const out = layers.map((l) => ({ ...l }));
  for (const s of shares) {
    if (s.ml <= 0) continue;
    const target =
      model === 'mixed'
        ? out.find((l) => l.batchId === s.batchId)
        : out.length && out[out.length - 1]!.batchId === s.batchId
          ? out[out.length - 1]
          : undefined;
    if (target) target.ml += s.ml;
    else out.push({ id: null, batchId: s.batchId, ml: s.ml });
  }
  return out;
}

/** Takes an outflow by the tank's model: proportional when well mixed, oldest first when FIFO. */
export function allocateOutflow(layers: readonly Layer[], takeMl: number, model: MixingModel): number[] {
  const w = layers.map((l) => l.ml);
  return model === 'fifo' ? allocateFifo(w, takeMl) : allocateProportional(w, takeMl);
}

/**
 * Fuel that may not leave while batches are under review: in a well-mixed tank any held batch
 * is mixed through all of it, so everything is held; in a FIFO tank, the held layer and every
 * layer above it (a draw would have to pass through the held fuel first).
 */
export function heldMl(
  layers: readonly Layer[],
  isHeld: (batchId: number | null) => boolean,
  model: MixingModel,
): number {
  const first = layers.findIndex((l) => l.ml > 0 && isHeld(l.batchId));
  if (first < 0) return 0;
  const total = layers.reduce((a, l) => a + l.ml, 0);
  if (model === 'mixed') return total;
  return layers.slice(first).reduce((a, l) => a + l.ml, 0);
}
