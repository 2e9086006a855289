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

/** Assumptions behind {@link expectedYields}, for display beside the estimate. */
export const YIELD_ASSUMPTIONS: readonly string[] = [
  'Oil is treated as triolein (885.4 g/mol) at 0.92 kg/L unless other values are given.',
  'Complete conversion: 1 mol triglyceride + 3 mol methanol → 3 mol methyl ester + 1 mol glycerol (stoichiometry).',
  'If less than 3 mol methanol per mol oil is added, conversion is limited in proportion.',
  'Glycerin is pure glycerol only (92.09 g/mol, 1.261 g/mL, CRC Handbook): about 10 % of the oil mass. The crude glycerin layer is larger, because it also holds excess methanol, catalyst and soap, which are not counted.',
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
    methanolReactedLiters,
    excessMethanolLiters: Math.max(0, methanolLiters - methanolReactedLiters),
    conversionFraction,
    assumptions: YIELD_ASSUMPTIONS,
  };
}
