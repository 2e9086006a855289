import { describe, it, expect } from 'vitest';
import {
  consumeFifo,
  energyCostCents,
  energyKwh,
  estimateHeatingKwh,
  batchCost,
  applyInflow,
  applyOutflow,
  averageCostCentsPerLiter,
  averageCostCentsPerGallon,
  recomputeMovingAverage,
  EMPTY_STOCK,
  type FifoLotByTotal,
} from '@/lib/costing';
import { litersToGallons } from '@/lib/units';

// All expected figures in this file are hand-computed; rounding follows lib/money (half away from zero).

describe('consumeFifo', () => {
  const drums: FifoLotByTotal[] = [
    { id: 'b', receivedAt: '2024-03-01', qty: 208, remainingQty: 208, totalCostCents: 31200 }, // 150 ¢/L
    { id: 'a', receivedAt: new Date('2024-01-15'), qty: 208, remainingQty: 10, totalCostCents: 29120 }, // 140 ¢/L
    { id: 'c', receivedAt: '2024-03-01', qty: 20, remainingQty: 20, totalCostCents: 3400 }, // 170 ¢/L, same day as b
  ];

  it('takes the oldest lot first, then ties by id; prices each slice', () => {
    // 22.6 L methanol for a 113 L batch (20 %, common practice)
    const r = consumeFifo(drums, 22.6);
    expect(r.allocations.map((a) => a.lotId)).toEqual(['a', 'b']);
    expect(r.allocations[0]).toMatchObject({ qty: 10, costCents: 1400, remainingQtyAfter: 0 }); // last 10 L of a: 29120 − round(29120 × 198/208) = 29120 − 27720
    expect(r.allocations[1]).toMatchObject({ qty: 12.6, costCents: 1890, remainingQtyAfter: 195.4 }); // 12.6 × 150
    expect(r.totalCostCents).toBe(3290);
    expect(r.shortfallQty).toBe(0);
    expect(r.allocatedQty).toBe(22.6);
  });

  it('orders lots received as epoch milliseconds exactly as the same days given as dates', () => {
    const asMs = drums.map((d) => ({ ...d, receivedAt: new Date(d.receivedAt).getTime() }));
    expect(consumeFifo(asMs, 22.6)).toEqual(consumeFifo(drums, 22.6));
    expect(consumeFifo(asMs, 250).allocations.map((a) => a.lotId)).toEqual(['a', 'b', 'c']);
  });

  it('spans several lots and reports a shortfall when stock runs out', () => {
    const r = consumeFifo(drums, 250);
    expect(r.allocations.map((a) => [a.lotId, a.qty])).toEqual([
      ['a', 10],
      ['b', 208],
      ['c', 20],
    ]);
    expect(r.totalCostCents).toBe(1400 + 31200 + 3400);
    expect(r.shortfallQty).toBe(12);
    expect(r.allocatedQty).toBe(238);
  });

  it('a lot used up over several batches costs exactly its purchase price', () => {
    // 3 L of catalyst solution for 1000 ¢: 333.33 ¢/L
    let lot: FifoLotByTotal = { id: 1, receivedAt: '2024-01-01', qty: 3, remainingQty: 3, totalCostCents: 1000 };
    const costs: number[] = [];
    for (let i = 0; i < 3; i += 1) {
      const r = consumeFifo([lot], 1);
      const a = r.allocations[0];
      expect(a).toBeDefined();
      if (!a) return;
      costs.push(a.costCents);
      lot = { ...lot, remainingQty: a.remainingQtyAfter };
    }
    expect(costs).toEqual([333, 334, 333]); // 333.33 → 333; 666.67 → 667 − 333; 1000 − 667
    expect(costs.reduce((x, y) => x + y, 0)).toBe(1000);
  });

  it('exactness holds with 3-decimal litres (floating-point noise ignored)', () => {
    let lot: FifoLotByTotal = { id: 'k', receivedAt: '2024-02-02', qty: 25, remainingQty: 25, totalCostCents: 9999 };
    let total = 0;
    for (const take of [1.111, 7.3, 0.589, 16]) {
      const r = consumeFifo([lot], take);
      const a = r.allocations[0];
      if (!a) throw new Error('expected an allocation');
      total += a.costCents;
      lot = { ...lot, remainingQty: a.remainingQtyAfter };
    }
    expect(lot.remainingQty).toBe(0);
    expect(total).toBe(9999);
  });

  it('supports lots priced per unit', () => {
    const r = consumeFifo([{ id: 'u', receivedAt: '2024-01-01', remainingQty: 5, unitCostCentsPerUnit: 412.5 }], 2.5);
    expect(r.allocations[0]).toMatchObject({ qty: 2.5, costCents: 1031 }); // 1031.25 → 1031
  });

  it('skips empty lots; zero need allocates nothing; no lots is all shortfall', () => {
    expect(consumeFifo(drums, 0).allocations).toEqual([]);
    const r = consumeFifo([{ ...drums[0]!, remainingQty: 0 }], 5);
    expect(r.allocations).toEqual([]);
    expect(r.shortfallQty).toBe(5);
    expect(consumeFifo([], 3).shortfallQty).toBe(3);
  });

  it('rejects invalid input', () => {
    expect(() => consumeFifo(drums, -1)).toThrow(RangeError);
    expect(() => consumeFifo([{ ...drums[0]!, receivedAt: 'not a date' }], 1)).toThrow(RangeError);
    expect(() => consumeFifo([{ ...drums[0]!, remainingQty: 300 }], 1)).toThrow(RangeError);
    expect(() => consumeFifo([{ ...drums[0]!, totalCostCents: 10.5 }], 1)).toThrow(RangeError);
  });
});

describe('energyCostCents', () => {
  it('metered: 12.5 kWh × 14.7 ¢/kWh = 183.75 → 184 ¢', () => {
    expect(energyCostCents({ kwh: 12.5, tariffCentsPerKwh: 14.7 })).toBe(184);
  });

  it('heater: 1.5 kW × 3 h = 4.5 kWh × 13 ¢ = 58.5 → 59 ¢ (half up)', () => {
    expect(energyKwh({ heaterKw: 1.5, hours: 3, tariffCentsPerKwh: 13 })).toBe(4.5);
    expect(energyCostCents({ heaterKw: 1.5, hours: 3, tariffCentsPerKwh: 13 })).toBe(59);
  });

  it('rejects negative inputs', () => {
    expect(() => energyCostCents({ kwh: -1, tariffCentsPerKwh: 10 })).toThrow(RangeError);
    expect(() => energyCostCents({ heaterKw: 1, hours: 1, tariffCentsPerKwh: -1 })).toThrow(RangeError);
  });

  it('heating 113 L of oil 20 → 55 °C needs ≈ 2.02 kWh before losses (specific heat 2.0 kJ/(kg·K), Int. J. Food Properties 11 (2008) 738–746; NIST SP 811)', () => {
    // 113 L × 0.92 kg/L × 2.0 kJ/(kg·K) × 35 K ÷ 3600 kJ/kWh
    expect(estimateHeatingKwh(113, 20, 55)).toBeCloseTo(2.0214, 4);
    expect(estimateHeatingKwh(113, 60, 55)).toBe(0);
  });
});

describe('batchCost', () => {
  it('adds the parts and divides by gallons released', () => {
    const r = batchCost({
      chemicalsCents: 4521,
      energyCents: 184,
      feedstockCents: 0,
      otherCents: 250,
      gallonsReleased: 29.85,
    });
    expect(r.totalCents).toBe(4955);
    expect(r.costPerGallonCents).toBe(166); // 165.996
    expect(r.breakdown).toEqual({ chemicalsCents: 4521, energyCents: 184, feedstockCents: 0, otherCents: 250 });
  });

  it('rounds the cost per gallon half up: 1001 ¢ ÷ 2 gal = 500.5 → 501', () => {
    expect(
      batchCost({ chemicalsCents: 1001, energyCents: 0, feedstockCents: 0, otherCents: 0, gallonsReleased: 2 })
        .costPerGallonCents,
    ).toBe(501);
  });

  it('works from litres via lib/units (113 L ≈ 29.85 gal, NIST SP 811)', () => {
    const r = batchCost({
      chemicalsCents: 5000,
      energyCents: 0,
      feedstockCents: 0,
      otherCents: 0,
      gallonsReleased: litersToGallons(113),
    });
    expect(r.costPerGallonCents).toBe(167); // 5000 ÷ 29.8514 = 167.49
  });

  it('a rejected batch (0 gallons) has no cost per gallon', () => {
    const r = batchCost({
      chemicalsCents: 3000,
      energyCents: 100,
      feedstockCents: 0,
      otherCents: 0,
      gallonsReleased: 0,
    });
    expect(r.totalCents).toBe(3100);
    expect(r.costPerGallonCents).toBeNull();
  });

  it('rejects fractional cents and negative gallons', () => {
    expect(() =>
      batchCost({ chemicalsCents: 1.5, energyCents: 0, feedstockCents: 0, otherCents: 0, gallonsReleased: 1 }),
    ).toThrow(RangeError);
    expect(() =>
      batchCost({ chemicalsCents: 1, energyCents: 0, feedstockCents: 0, otherCents: 0, gallonsReleased: -1 }),
    ).toThrow(RangeError);
  });
});

describe('moving weighted average of the tank', () => {
  it('inflows average by value; outflows leave at the average', () => {
    let s = applyInflow(EMPTY_STOCK, 100, 10000); // 100 ¢/L
    s = applyInflow(s, 50, 6000); // 120 ¢/L
    expect(s).toEqual({ qtyLiters: 150, totalValueCents: 16000 });
    expect(averageCostCentsPerLiter(s)).toBeCloseTo(106.667, 3);
    const out = applyOutflow(s, 30); // 16000 × 30 / 150
    expect(out.valueCents).toBe(3200);
    expect(out.state).toEqual({ qtyLiters: 120, totalValueCents: 12800 });
    const empty = applyOutflow(out.state, 120);
    expect(empty.valueCents).toBe(12800);
    expect(empty.state).toEqual({ qtyLiters: 0, totalValueCents: 0 });
    expect(averageCostCentsPerLiter(empty.state)).toBeNull();
  });

  it('value stays integer and the stock empties to exactly zero', () => {
    let s = applyInflow(EMPTY_STOCK, 3, 1000);
    const removed: number[] = [];
    for (let i = 0; i < 3; i += 1) {
      const r = applyOutflow(s, 1);
      removed.push(r.valueCents);
      s = r.state;
    }
    expect(removed).toEqual([333, 334, 333]); // 333.33 → 333; 667 × 1/2 = 333.5 → 334; 333
    expect(s.totalValueCents).toBe(0);
  });

  it('average per gallon: 100 ¢/L × 3.785411784 = 378.54 → 379 ¢/gal (NIST SP 811)', () => {
    expect(averageCostCentsPerGallon({ qtyLiters: 100, totalValueCents: 10000 })).toBe(379);
    expect(averageCostCentsPerGallon(EMPTY_STOCK)).toBeNull();
  });

  it('recomputes from a list of movements', () => {
    const { state, steps } = recomputeMovingAverage([
      { kind: 'in', liters: 100, valueCents: 10000 },
      { kind: 'in', liters: 50, valueCents: 6000 },
      { kind: 'out', liters: 30 },
      { kind: 'out', liters: 12.345 },
    ]);
    expect(steps.map((s) => s.valueCents)).toEqual([10000, 6000, 3200, 1317]); // 12800 × 12.345 / 120 = 1316.8
    expect(state).toEqual({ qtyLiters: 107.655, totalValueCents: 11483 });
  });

  it('refuses to draw more than is on hand, and bad inflows', () => {
    expect(() => applyOutflow({ qtyLiters: 10, totalValueCents: 1000 }, 10.5)).toThrow(RangeError);
    expect(() => applyInflow(EMPTY_STOCK, 0, 100)).toThrow(RangeError);
    expect(() => applyInflow(EMPTY_STOCK, 10, 10.5)).toThrow(RangeError);
  });
});
