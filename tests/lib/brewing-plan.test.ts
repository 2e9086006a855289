// The batch plan (lib/brewing/plan.ts) and the brewing schemas (lib/validation/brewing.ts):
// defaults, the titrant conversion and field-named errors. Expected values from
// /work/shared/REFERENCES.md, source named beside each check.
import { describe, expect, it } from 'vitest';
import { computePlan } from '@/lib/brewing/plan';
import { HttpError } from '@/lib/http';
import {
  batchCreateSchema,
  chemicalLotCreateSchema,
  moneyCents,
  num,
  temperatureCreateSchema,
} from '@/lib/validation/brewing';

const trials = (xs: number[]) => ({ source: 'trials' as const, trials: xs });

describe('computePlan', () => {
  it('W1 (common practice worksheet): 113 L, KOH 90 %, base 7 g/L, trials 4.9/5.1/5.2 → 12.844 g/L, 1451.4 g', () => {
    const p = computePlan({
      oilLiters: 113,
      titration: trials([4.9, 5.1, 5.2]),
      catalyst: 'KOH',
      baseGramsPerLiter: 7,
      purityPct: 90,
    });
    expect(p.titration.averageMl).toBeCloseTo(5.0667, 4);
    expect(p.catalystResult.gramsPerLiter).toBeCloseTo(12.844, 3);
    expect(p.catalystResult.totalGrams).toBeCloseTo(1451.4, 1);
    expect(p.catalystResult.rule).toBe('base-over-purity-plus-titration');
    expect([p.baseSource, p.puritySource]).toEqual(['typed', 'typed']);
    // 20 % of oil volume by default (common practice)
    expect(p.methanol).toMatchObject({ mode: 'percent', pct: 20 });
    expect(p.methanol.liters).toBeCloseTo(22.6, 9);
  });

  it('takes the recipe, then the next lot’s purity, then typical values, and says which it used', () => {
    const recipe = { catalyst: 'NaOH' as const, baseGramsPerLiter: 3.5, purityPct: 97, methanolPct: 22 };
    const a = computePlan({ oilLiters: 10, titration: trials([2]) }, recipe);
    expect(a).toMatchObject({
      catalyst: 'NaOH',
      baseGramsPerLiter: 3.5,
      baseSource: 'recipe',
      purityPct: 97,
      puritySource: 'recipe',
    });
    expect(a.methanol.liters).toBeCloseTo(2.2, 9);
    const b = computePlan({ oilLiters: 10, titration: trials([2]), nextLotPurityPct: 99 }, recipe);
    expect(b).toMatchObject({ purityPct: 99, puritySource: 'next-lot' });
    // Another catalyst than the recipe's: the recipe's amounts do not apply. KOH default base = 3.5 × 1.4027 (IUPAC molar masses), flake 90 % (common practice).
    const c = computePlan({ oilLiters: 10, titration: trials([2]), catalyst: 'KOH' }, recipe);
    expect(c.baseSource).toBe('default');
    expect(c.baseGramsPerLiter).toBeCloseTo(4.91, 2);
    expect(c).toMatchObject({ purityPct: 90, puritySource: 'typical' });
  });

  it('converts an oil lot titration made with NaOH for a KOH batch (× 56.106 / 39.997, IUPAC)', () => {
    const p = computePlan({
      oilLiters: 100,
      titration: { source: 'oil-lot', trials: [4], titrant: 'NaOH', oilLotId: 7 },
      catalyst: 'KOH',
      baseGramsPerLiter: 7,
      purityPct: 100,
    });
    expect(p.titration).toMatchObject({ source: 'oil-lot', oilLotId: 7, titrant: 'NaOH', averageMl: 4 });
    expect(p.titration.averageForCatalystMl).toBeCloseTo(4 * 1.4027, 3);
    // purity 100 %: 7 + 5.611 g/L × 100 L
    expect(p.catalystResult.totalGrams).toBeCloseTo((7 + 4 * (56.106 / 39.997)) * 100, 6);
    // AN with a NaOH titrant is multiplied by 1.4027 (ASTM D974 definition, REFERENCES.md)
    expect(p.oil.acidNumber).toBeCloseTo((4 * 1.4027) / 0.92, 2);
  });

  it('NaOH titration for a KOH batch at 90 %: converted by molar mass, then divided by purity once (IUPAC; common practice purity rule)', () => {
    const p = computePlan({
      oilLiters: 100,
      titration: { source: 'oil-lot', trials: [4], titrant: 'NaOH', oilLotId: 7 },
      catalyst: 'KOH',
      baseGramsPerLiter: 7,
      purityPct: 90,
    });
    expect(p.titrantFrom).toBe('pure-reagent');
    expect(p.catalystResult.rule).toBe('converted-all-over-purity');
    expect(p.catalystResult.gramsPerLiter).toBeCloseTo((7 + 4 * (56.106 / 39.997)) / 0.9, 9);
    // said to be made from the batch's own KOH: impossible for a NaOH titrant → 422 on titrantFrom
    expect(() =>
      computePlan({
        oilLiters: 100,
        titration: { source: 'trials', trials: [4], titrant: 'NaOH' },
        catalyst: 'KOH',
        purityPct: 90,
        titrantFrom: 'same-catalyst',
      }),
    ).toThrow(HttpError);
  });

  it('projects fuel from released batches, the ideal only without history (stoichiometry; common practice)', () => {
    const none = computePlan({ oilLiters: 100, titration: trials([4]), catalyst: 'NaOH' });
    expect(none.yieldProjection.source).toBe('ideal');
    expect(none.projectedFuelLiters).toBeCloseTo(none.yields.fuelLiters, 9);
    const hist = computePlan(
      { oilLiters: 100, titration: trials([4]), catalyst: 'NaOH' },
      {},
      { yieldHistory: [{ oilLiters: 50, releasedLiters: 45 }] },
    );
    expect(hist.projectedFuelLiters).toBeCloseTo(90, 9);
  });

  it('one trial is enough; a 6:1 molar ratio gives ≈ 252 mL per L of oil (W5, CRC values)', () => {
    const p = computePlan({
      oilLiters: 1,
      titration: trials([3]),
      catalyst: 'NaOH',
      baseGramsPerLiter: 3.5,
      purityPct: 100,
      methanolMode: 'molar-ratio',
      molarRatio: 6,
    });
    expect(p.catalystResult.gramsPerLiter).toBeCloseTo(6.5, 9); // W3 (common practice): NaOH, titration 3 → 6.5 g/L
    expect(p.methanol.liters).toBeCloseTo(0.252, 3);
    expect(p.titration.outlierIndexes).toEqual([]);
  });

  it('flags oil that needs acid pre-treatment (8–10 mL KOH: poor, common practice)', () => {
    const p = computePlan({
      oilLiters: 50,
      titration: trials([9, 9.2, 8.8]),
      catalyst: 'KOH',
      baseGramsPerLiter: 7,
      purityPct: 90,
    });
    expect(p.oil).toMatchObject({ band: 'poor', needsAcidPretreatment: true });
  });

  it('answers 422 naming the field for no titration and for a blank above the trials', () => {
    const err = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return e as HttpError;
      }
      throw new Error('expected an error');
    };
    const none = err(() => computePlan({ oilLiters: 10, titration: null }));
    expect(none).toBeInstanceOf(HttpError);
    expect([none.status, Object.keys(none.fields ?? {})]).toEqual([422, ['titrationTrials']]);
    const blank = err(() => computePlan({ oilLiters: 10, titration: trials([1]), titrationBlankMl: 2 }));
    expect(Object.keys(blank.fields ?? {})).toEqual(['titrationBlankMl']);
  });
});

describe('brewing schemas', () => {
  it('numbers may be typed as text, but words are refused', () => {
    expect(num().parse('12.5')).toBe(12.5);
    expect(num().safeParse('hot').success).toBe(false);
    expect(num().safeParse('').success).toBe(false);
    const t = temperatureCreateSchema.safeParse({ temp: 'warm' });
    expect(t.success ? null : t.error.issues[0]!.path).toEqual(['temp']);
  });

  it('money becomes integer cents (no floats), never negative', () => {
    expect(moneyCents().parse('12.34')).toBe(1234);
    expect(moneyCents().parse(84.5)).toBe(8450);
    expect(moneyCents().safeParse('12.345').success).toBe(false);
    expect(moneyCents().safeParse('-1.00').success).toBe(false);
  });

  it('catalyst lots need a purity in (0, 100]; methanol may not have one; units fit the chemical', () => {
    const base = { supplier: 'X', receivedOn: '2026-10-01', quantity: 1, totalCost: '1.00' };
    const paths = (v: unknown) => {
      const r = chemicalLotCreateSchema.safeParse(v);
      return r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
    };
    expect(paths({ ...base, kind: 'KOH', unit: 'kg', purityPct: 90 })).toEqual([]);
    expect(paths({ ...base, kind: 'KOH', unit: 'kg', purityPct: 0 })).toEqual(['purityPct']);
    expect(paths({ ...base, kind: 'KOH', unit: 'kg', purityPct: 100.01 })).toEqual(['purityPct']);
    expect(paths({ ...base, kind: 'NaOH', unit: 'kg' })).toEqual(['purityPct']);
    expect(paths({ ...base, kind: 'methanol', unit: 'L', purityPct: 99 })).toEqual(['purityPct']);
    expect(paths({ ...base, kind: 'methanol', unit: 'kg' })).toEqual(['unit']);
    expect(paths({ ...base, kind: 'other', unit: 'L' })).toEqual(['description']);
    expect(paths({ ...base, kind: 'methanol', unit: 'L', coopId: 2 })).toEqual(['']);
  });

  it('a batch needs trials or an oil lot, and dates must exist', () => {
    const r = batchCreateSchema.safeParse({ oilVolume: 30, titrationTrials: [] });
    expect(r.success ? [] : r.error.issues.map((i) => i.path.join('.'))).toEqual(['titrationTrials']);
    expect(batchCreateSchema.safeParse({ oilVolume: 30, oilLotId: 4 }).success).toBe(true);
    const d = batchCreateSchema.safeParse({ oilVolume: 30, titrationTrials: [1], batchDate: '2026-02-30' });
    expect(d.success ? [] : d.error.issues.map((i) => i.path.join('.'))).toEqual(['batchDate']);
  });
});

describe('chemical purchases in pounds (NIST SP 811: 1 lb = 0.45359237 kg)', () => {
  it('a catalyst may be entered in lb; methanol may not', () => {
    const base = { supplier: 'Lakeside Lab Goods', receivedOn: '2026-10-01', quantity: 11, totalCost: '42.50' };
    expect(chemicalLotCreateSchema.safeParse({ ...base, kind: 'KOH', unit: 'lb', purityPct: 90 }).success).toBe(true);
    expect(chemicalLotCreateSchema.safeParse({ ...base, kind: 'methanol', unit: 'lb' }).success).toBe(false);
  });
});
