import { describe, expect, it } from 'vitest';
import {
  addTo,
  allocateFifo,
  allocateOutflow,
  allocateProportional,
  heldMl,
  sharesOf,
  takeFrom,
  type Layer,
} from '@/lib/tank/lineage-math';

// Hand-computed examples (worked by hand on paper, in whole millilitres). The two mixing models
// are the usual assumptions for a shared fuel tank (common practice): a stirred or recirculated
// tank is well mixed, so a draw carries every batch in proportion; an unstirred tank drawn
// from the bottom gives up its oldest fuel first.

const layer = (batchId: number | null, ml: number, id: number | null = null): Layer => ({ id, batchId, ml });
const sum = (xs: number[]) => xs.reduce((a, x) => a + x, 0);

describe('well-mixed tank: proportional shares, exact to the millilitre', () => {
  it('splits 40 L from 100 L (batch 12) + 300 L (batch 13) as 10 L + 30 L', () => {
    // 40 000 × 100 000 / 400 000 = 10 000; 40 000 × 300 000 / 400 000 = 30 000 (hand-computed)
    expect(allocateProportional([100_000, 300_000], 40_000)).toEqual([10_000, 30_000]);
  });

  it('gives the leftover millilitre to the largest remainder, ties to the oldest layer', () => {
    // 10 mL from three equal layers: 3.333… each → floors 3 + 3 + 3, one left → oldest (hand-computed)
    expect(allocateProportional([1000, 1000, 1000], 10)).toEqual([4, 3, 3]);
    // 7 mL from 1 000 + 2 000 mL: 2.333… and 4.666… → floors 2 + 4, one left → larger remainder (the second)
    expect(allocateProportional([1000, 2000], 7)).toEqual([2, 5]);
  });

  it('always sums exactly to the draw, also for huge volumes past 2^53 in the products', () => {
    const w = [123_456_789_012, 987_654_321, 1, 55_555_555_555];
    for (const take of [1, 17, 1_000_003, 99_999_999_999]) {
      const parts = allocateProportional(w, take);
      expect(sum(parts)).toBe(take);
      parts.forEach((p, i) => expect(p).toBeLessThanOrEqual(w[i]!));
    }
  });

  it('a draw of 20.000 L from 75.708 L (batch 5) + 24.292 L (unattributed) carries 15.142 L + 4.858 L', () => {
    // 20 000 × 75 708 / 100 000 = 15 141.6 → 15 141, remainder .6; 20 000 × 24 292 / 100 000 = 4 858.4 → 4 858, .4
    // one millilitre left → the larger remainder (batch 5): 15 142 + 4 858 = 20 000 (hand-computed)
    const layers = [layer(5, 75_708, 1), layer(null, 24_292, 2)];
    const taken = allocateOutflow(layers, 20_000, 'mixed');
    expect(taken).toEqual([15_142, 4_858]);
    expect(sharesOf(layers, taken)).toEqual([
      { batchId: 5, ml: 15_142 },
      { batchId: null, ml: 4_858 },
    ]);
    expect(takeFrom(layers, taken).map((l) => l.ml)).toEqual([60_566, 19_434]);
  });

  it('keeps one layer per batch: fuel of a batch already in the tank joins it', () => {
    const after = addTo(
      [layer(5, 1000, 1), layer(6, 500, 2)],
      [
        { batchId: 5, ml: 250 },
        { batchId: 7, ml: 100 },
      ],
      'mixed',
    );
    expect(after).toEqual([layer(5, 1250, 1), layer(6, 500, 2), layer(7, 100)]);
  });
});

describe('first-in-first-out tank', () => {
  it('takes the oldest fuel first: 150 L from 100 L (batch 12) then 300 L (batch 13) = 100 L + 50 L', () => {
    // hand-computed: the whole of batch 12, then 50 L of batch 13
    const layers = [layer(12, 100_000, 1), layer(13, 300_000, 2)];
    const taken = allocateOutflow(layers, 150_000, 'fifo');
    expect(taken).toEqual([100_000, 50_000]);
    expect(sharesOf(layers, taken)).toEqual([
      { batchId: 12, ml: 100_000 },
      { batchId: 13, ml: 50_000 },
    ]);
    expect(takeFrom(layers, taken).map((l) => l.ml)).toEqual([0, 250_000]);
  });

  it('stacks new fuel on top, joining the newest layer only when it is the same batch', () => {
    expect(addTo([layer(5, 10, 1), layer(6, 10, 2)], [{ batchId: 5, ml: 4 }], 'fifo')).toEqual([
      layer(5, 10, 1),
      layer(6, 10, 2),
      layer(5, 4),
    ]);
    expect(addTo([layer(5, 10, 1), layer(6, 10, 2)], [{ batchId: 6, ml: 4 }], 'fifo')).toEqual([
      layer(5, 10, 1),
      layer(6, 14, 2),
    ]);
  });

  it('refuses to take more than the tank holds', () => {
    expect(() => allocateFifo([10, 20], 31)).toThrow(RangeError);
    expect(() => allocateProportional([10, 20], 31)).toThrow(RangeError);
  });
});

describe('held fuel while a batch is under review', () => {
  const layers = [layer(1, 100, 1), layer(2, 50, 2), layer(3, 25, 3)];
  const under = (id: number) => (b: number | null) => b === id;
  it('holds the whole of a well-mixed tank (the suspect fuel is mixed through it)', () => {
    expect(heldMl(layers, under(2), 'mixed')).toBe(175);
  });
  it('holds the held layer and everything above it in a FIFO tank', () => {
    expect(heldMl(layers, under(2), 'fifo')).toBe(75);
    expect(heldMl(layers, under(1), 'fifo')).toBe(175);
    expect(heldMl(layers, under(9), 'fifo')).toBe(0);
  });
});
