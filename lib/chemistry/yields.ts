import {
  B100_DENSITY_KG_PER_L,
  GLYCEROL_DENSITY_G_PER_ML,
  GLYCEROL_MOLAR_MASS_G_PER_MOL,
  GLYCEROL_PER_TRIGLYCERIDE_MOL,
  METHANOL_DENSITY_G_PER_ML,
  METHANOL_MOLAR_MASS_G_PER_MOL,
  METHANOL_PER_TRIGLYCERIDE_MOL,
  OIL_DENSITY_G_PER_ML,
  TRIOLEIN_MOLAR_MASS_G_PER_MOL,
} from './constants';
import type { OilProperties } from './methanol';

/**
 * Crude glycerin layer as a fraction of the oil volume. Common practice (small-batch brewers'
 * records), with its reason: pure glycerol is ≈ 8 % of the oil volume, but the layer also takes
 * most of the excess methanol, the catalyst, soap and some entrained fuel.
 */
export const CRUDE_GLYCERIN_FRACTION = { low: 0.15, typical: 0.2, high: 0.25 } as const; // common practice

/**
 * Fuel out per oil in, by volume, at complete conversion with 0.88 kg/L fuel and 0.92 kg/L oil:
 * ≈ 1.05 (stoichiometry, CRC values, US DOE AFDC density). Used only without batch history.
 */
export const IDEAL_FUEL_PER_OIL = (() => {
  const oilMol = (1000 * OIL_DENSITY_G_PER_ML) / TRIOLEIN_MOLAR_MASS_G_PER_MOL; // per L of oil
  const fuelGrams =
    1000 * OIL_DENSITY_G_PER_ML +
    oilMol * METHANOL_PER_TRIGLYCERIDE_MOL * METHANOL_MOLAR_MASS_G_PER_MOL -
    oilMol * GLYCEROL_MOLAR_MASS_G_PER_MOL;
  return fuelGrams / 1000 / B100_DENSITY_KG_PER_L;
})();

/** How many recent released batches the yield projection looks at. */
export const YIELD_HISTORY_BATCHES = 10; // a choice: recent enough to reflect today's equipment, enough for a stable median

/** One released batch for {@link projectedFuelYield}. */
export interface YieldHistoryBatch {
  oilLiters: number;
  releasedLiters: number;
}

/** Result of {@link projectedFuelYield}. */
export interface FuelYieldProjection {
  /** Expected fuel out ÷ oil in, by volume. */
  ratio: number;
  source: 'history' | 'ideal';
  /** Batches the median was taken over (0 for the ideal). */
  batches: number;
  /** The stoichiometric ideal, shown beside the history figure. */
  idealRatio: number;
  explanation: string;
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/**
 * Expected fuel yield for planning: the median of the co-op's recent finished batches (released or
 * imported; fuel out ÷ oil in), or the stoichiometric ideal (≈ 1.05) only when there is no history.
 * Batches with no oil or no fuel are ignored. Pass the most recent batches first; only the
 * first {@link YIELD_HISTORY_BATCHES} are used.
 * @param history recent finished batches, newest first
 * @returns the ratio, where it came from, and the ideal beside it
 */
export function projectedFuelYield(history: readonly YieldHistoryBatch[]): FuelYieldProjection {
  const ratios = history
    .filter(
      (b) =>
        Number.isFinite(b.oilLiters) && Number.isFinite(b.releasedLiters) && b.oilLiters > 0 && b.releasedLiters > 0,
    )
    .slice(0, YIELD_HISTORY_BATCHES)
    .map((b) => b.releasedLiters / b.oilLiters);
  if (ratios.length === 0) {
    return {
      ratio: IDEAL_FUEL_PER_OIL,
      source: 'ideal',
      batches: 0,
      idealRatio: IDEAL_FUEL_PER_OIL,
      explanation: `No finished batches yet (released, or imported from past records): using the stoichiometric ideal of ${IDEAL_FUEL_PER_OIL.toFixed(2)} volumes of fuel per volume of oil; real batches usually release less.`,
    };
  }
  const ratio = median(ratios);
  return {
    ratio,
    source: 'history',
    batches: ratios.length,
    idealRatio: IDEAL_FUEL_PER_OIL,
    explanation: `Median of the last ${ratios.length} finished batch${ratios.length === 1 ? '' : 'es'} (released, or imported from past records): ${(ratio * 100).toFixed(1)} % of the oil volume released as fuel (the stoichiometric ideal is ${(IDEAL_FUEL_PER_OIL * 100).toFixed(1)} %).`,
  };
}

/** Assumptions behind {@link expectedYields}, for display beside the estimate. */
export const YIELD_ASSUMPTIONS: readonly string[] = [
  'Oil is treated as triolein (885.4 g/mol) at 0.92 kg/L unless other values are given.',
  'Complete conversion: 1 mol triglyceride + 3 mol methanol → 3 mol methyl ester + 1 mol glycerol (stoichiometry).',
  'If less than 3 mol methanol per mol oil is added, conversion is limited in proportion.',
  'Pure glycerol (92.09 g/mol, 1.261 g/mL, CRC Handbook) is about 10 % of the oil mass (≈ 8 % of its volume). The crude glycerin layer to drain and store is larger — about 20 % of the oil volume (15–25 %, common practice) — because it also holds excess methanol, catalyst, soap and some fuel.',
  'Excess methanol is not counted in either product.',
  'Fuel volume uses a B100 density of 0.88 kg/L (US DOE Alternative Fuels Data Center); losses in washing and drying are ignored.',
];

/** Result of {@link expectedYields}. */
export interface ExpectedYields {
  /** Estimated biodiesel before washing losses, L. */
  fuelLiters: number;
  fuelKg: number;
  /** Pure glycerol released, L (the crude glycerin layer is larger). */
  glycerolLiters: number;
  /** The crude glycerin layer to expect, L (≈ 20 % of the oil volume, common practice), with its usual range. */
  crudeGlycerinLiters: number;
  crudeGlycerinRangeLiters: [number, number];
  glycerolKg: number;
  /** Methanol consumed by the reaction, L. */
  methanolReactedLiters: number;
  /** Methanol left over (ends up split between glycerin layer and fuel), L. */
  excessMethanolLiters: number;
  /** Fraction of the oil that the methanol given can convert (1 when methanol ≥ 3:1). */
  conversionFraction: number;
  assumptions: readonly string[];
}

/**
 * Estimates fuel and glycerol from a batch by stoichiometry (see {@link YIELD_ASSUMPTIONS}):
 * fuel mass = oil mass + methanol reacted − glycerol; fuel litres = mass ÷ 0.88 kg/L.
 * For 1 L of oil with enough methanol: ≈ 1.05 L fuel and ≈ 0.076 L glycerol.
 * @param oilLiters oil volume, L
 * @param methanolLiters methanol added, L
 * @param oil optional oil density (g/mL) and molar mass (g/mol)
 * @returns estimated yields and the assumptions used
 */
export function expectedYields(oilLiters: number, methanolLiters: number, oil: OilProperties = {}): ExpectedYields {
  if (!Number.isFinite(oilLiters) || oilLiters < 0) throw new RangeError(`Oil volume must be ≥ 0 L, got ${oilLiters}`);
  if (!Number.isFinite(methanolLiters) || methanolLiters < 0) {
    throw new RangeError(`Methanol volume must be ≥ 0 L, got ${methanolLiters}`);
  }
  const density = oil.oilDensityGPerMl ?? OIL_DENSITY_G_PER_ML;
  const molarMass = oil.oilMolarMassGPerMol ?? TRIOLEIN_MOLAR_MASS_G_PER_MOL;
  if (!(density > 0) || !(molarMass > 0)) throw new RangeError('Oil density and molar mass must be positive');

  const oilGrams = oilLiters * 1000 * density;
  const oilMol = oilGrams / molarMass;
  const methanolMolAvailable = (methanolLiters * 1000 * METHANOL_DENSITY_G_PER_ML) / METHANOL_MOLAR_MASS_G_PER_MOL;
  const methanolMolNeeded = oilMol * METHANOL_PER_TRIGLYCERIDE_MOL;
  const conversionFraction = oilMol === 0 ? 0 : Math.min(1, methanolMolAvailable / methanolMolNeeded);

  const reactedOilMol = oilMol * conversionFraction;
  const methanolReactedGrams = reactedOilMol * METHANOL_PER_TRIGLYCERIDE_MOL * METHANOL_MOLAR_MASS_G_PER_MOL;
  const glycerolGrams = reactedOilMol * GLYCEROL_PER_TRIGLYCERIDE_MOL * GLYCEROL_MOLAR_MASS_G_PER_MOL;
  const fuelGrams = oilGrams * conversionFraction + methanolReactedGrams - glycerolGrams;
  const methanolReactedLiters = methanolReactedGrams / METHANOL_DENSITY_G_PER_ML / 1000;

  return {
    fuelKg: fuelGrams / 1000,
    fuelLiters: fuelGrams / 1000 / B100_DENSITY_KG_PER_L,
    glycerolKg: glycerolGrams / 1000,
    glycerolLiters: glycerolGrams / GLYCEROL_DENSITY_G_PER_ML / 1000,
    crudeGlycerinLiters: oilLiters * CRUDE_GLYCERIN_FRACTION.typical,
    crudeGlycerinRangeLiters: [oilLiters * CRUDE_GLYCERIN_FRACTION.low, oilLiters * CRUDE_GLYCERIN_FRACTION.high],
    methanolReactedLiters,
    excessMethanolLiters: Math.max(0, methanolLiters - methanolReactedLiters),
    conversionFraction,
    assumptions: YIELD_ASSUMPTIONS,
  };
}
