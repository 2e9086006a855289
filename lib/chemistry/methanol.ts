import {
  METHANOL_DENSITY_G_PER_ML,
  METHANOL_MOLAR_MASS_G_PER_MOL,
  OIL_DENSITY_G_PER_ML,
  TRIOLEIN_MOLAR_MASS_G_PER_MOL,
} from './constants';

/** Default methanol, % of oil volume. */
export const DEFAULT_METHANOL_PERCENT = 20; // common practice
/** Methanol for an unknown feedstock, % of oil volume. */
export const UNKNOWN_FEEDSTOCK_METHANOL_PERCENT = 25; // common practice
/** Stoichiometric methanol : triglyceride molar ratio. */
export const STOICHIOMETRIC_MOLAR_RATIO = 3; // stoichiometry of transesterification
/** Usual methanol : triglyceride molar ratio (100 % excess). */
export const USUAL_MOLAR_RATIO = 6; // common practice

/** Oil properties used for molar-ratio arithmetic (default: triolein at 0.92 g/mL). */
export interface OilProperties {
  /** Oil density, g/mL; default 0.92 (published measurements of waste cooking oil). */
  oilDensityGPerMl?: number;
  /** Oil molar mass, g/mol; default 885.4 (triolein, CRC Handbook). */
  oilMolarMassGPerMol?: number;
}

function oilMolesPerLiter(oil: OilProperties = {}): number {
  const density = oil.oilDensityGPerMl ?? OIL_DENSITY_G_PER_ML;
  const molarMass = oil.oilMolarMassGPerMol ?? TRIOLEIN_MOLAR_MASS_G_PER_MOL;
  if (!(density > 0) || !(molarMass > 0)) throw new RangeError('Oil density and molar mass must be positive');
  return (1000 * density) / molarMass;
}

/** Moles of methanol in one litre of methanol (0.7915 g/mL ÷ 32.04 g/mol × 1000 mL). */
const METHANOL_MOLES_PER_LITER = (1000 * METHANOL_DENSITY_G_PER_ML) / METHANOL_MOLAR_MASS_G_PER_MOL;

function assertOilLiters(oilLiters: number): void {
  if (!Number.isFinite(oilLiters) || oilLiters < 0) throw new RangeError(`Oil volume must be ≥ 0 L, got ${oilLiters}`);
}

/**
 * Methanol as a percentage of the oil volume (20 % by default, common practice).
 * @param oilLiters oil volume, L
 * @param methanolPct methanol, % of oil volume (default 20)
 * @returns methanol volume, L
 */
export function methanolLitersByPercent(oilLiters: number, methanolPct = DEFAULT_METHANOL_PERCENT): number {
  assertOilLiters(oilLiters);
  if (!Number.isFinite(methanolPct) || methanolPct < 0)
    throw new RangeError(`Methanol % must be ≥ 0, got ${methanolPct}`);
  return (oilLiters * methanolPct) / 100;
}

/**
 * Methanol for a chosen methanol : triglyceride molar ratio (3:1 stoichiometric, 6:1 usual),
 * using triolein 885.4 g/mol at 0.92 g/mL and methanol 32.04 g/mol at 0.7915 g/mL (CRC).
 * @param oilLiters oil volume, L
 * @param molarRatio moles of methanol per mole of oil (e.g. 6)
 * @param oil optional oil density and molar mass
 * @returns methanol volume, L (3:1 ≈ 0.126 L per L of oil)
 */
export function methanolLitersByMolarRatio(oilLiters: number, molarRatio: number, oil: OilProperties = {}): number {
  assertOilLiters(oilLiters);
  if (!Number.isFinite(molarRatio) || molarRatio < 0)
    throw new RangeError(`Molar ratio must be ≥ 0, got ${molarRatio}`);
  return (oilLiters * oilMolesPerLiter(oil) * molarRatio) / METHANOL_MOLES_PER_LITER;
}

/**
 * The methanol : triglyceride molar ratio that a methanol percentage represents.
 * @param methanolPct methanol, % of oil volume (e.g. 20)
 * @param oil optional oil density and molar mass
 * @returns molar ratio (20 % ≈ 4.75)
 */
export function molarRatioFromPercent(methanolPct: number, oil: OilProperties = {}): number {
  if (!Number.isFinite(methanolPct) || methanolPct < 0)
    throw new RangeError(`Methanol % must be ≥ 0, got ${methanolPct}`);
  return ((methanolPct / 100) * METHANOL_MOLES_PER_LITER) / oilMolesPerLiter(oil);
}

/**
 * The methanol percentage (of oil volume) that a molar ratio represents.
 * @param molarRatio moles of methanol per mole of oil
 * @param oil optional oil density and molar mass
 * @returns methanol, % of oil volume (6:1 ≈ 25.2 %)
 */
export function percentFromMolarRatio(molarRatio: number, oil: OilProperties = {}): number {
  return methanolLitersByMolarRatio(1, molarRatio, oil) * 100;
}

/** Grouped access: `methanolLiters.byPercent(oilLiters)`, `methanolLiters.byMolarRatio(oilLiters, 6)`. */
export const methanolLiters = {
  byPercent: methanolLitersByPercent,
  byMolarRatio: methanolLitersByMolarRatio,
} as const;
