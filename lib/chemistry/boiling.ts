import { METHANOL_BOILING_POINT_C } from './constants';

/**
 * Antoine constants for methanol, log10(P / bar) = A − B / (T / K + C), valid 288.1–356.8 K.
 * NIST Chemistry WebBook, methanol, "Antoine Equation Parameters" (Ambrose & Sprake, 1970).
 */
export const METHANOL_ANTOINE = { A: 5.20409, B: 1581.341, C: -33.5, minK: 288.1, maxK: 356.83 } as const; // NIST WebBook

/** US Standard Atmosphere 1976, troposphere (below 11 km). */
export const STANDARD_ATMOSPHERE = {
  seaLevelPa: 101_325, // US Standard Atmosphere 1976 (= 1 atm)
  seaLevelK: 288.15, // US Standard Atmosphere 1976
  lapseRateKPerM: 0.0065, // US Standard Atmosphere 1976
  gravityMPerS2: 9.80665, // standard gravity (CGPM 1901; NIST SP 330)
  airMolarMassKgPerMol: 0.0289644, // US Standard Atmosphere 1976
  gasConstant: 8.31432, // J/(mol·K), as used by US Standard Atmosphere 1976
} as const;

/** Highest elevation the barometric formula here is used for, m (top of the troposphere layer is 11 km). */
export const MAX_ELEVATION_M = 5000; // practical cap: no co-op brews higher; the formula holds to 11 km
/** Lowest elevation accepted, m (the Dead Sea shore is about −430 m). */
export const MIN_ELEVATION_M = -500;

const KELVIN_OFFSET = 273.15; // exact by definition (NIST SP 811)
const PA_PER_BAR = 100_000; // exact by definition (NIST SP 811)

function assertElevation(elevationM: number): void {
  if (!Number.isFinite(elevationM) || elevationM < MIN_ELEVATION_M || elevationM > MAX_ELEVATION_M) {
    throw new RangeError(`Elevation must be between ${MIN_ELEVATION_M} and ${MAX_ELEVATION_M} m, got ${elevationM}`);
  }
}

/**
 * Standard air pressure at an elevation, by the barometric formula of the US Standard
 * Atmosphere 1976: P = P0 · (1 − L·h / T0)^(g·M / (R·L)).
 * @param elevationM elevation above sea level, m
 * @returns pressure, Pa (0 m → 101 325 Pa; 1 600 m ≈ 83 500 Pa)
 */
export function pressureAtElevationPa(elevationM: number): number {
  assertElevation(elevationM);
  const { seaLevelPa, seaLevelK, lapseRateKPerM, gravityMPerS2, airMolarMassKgPerMol, gasConstant } =
    STANDARD_ATMOSPHERE;
  const exponent = (gravityMPerS2 * airMolarMassKgPerMol) / (gasConstant * lapseRateKPerM); // ≈ 5.2559
  return seaLevelPa * (1 - (lapseRateKPerM * elevationM) / seaLevelK) ** exponent;
}

/**
 * Temperature at which methanol's vapour pressure equals `pressurePa`, from the NIST Antoine
 * equation: T = B / (A − log10 P) − C.
 * @param pressurePa pressure, Pa
 * @returns boiling temperature, °C (at 101 325 Pa ≈ 64.55 °C; CRC lists 64.7 °C)
 */
export function methanolAntoineBoilingC(pressurePa: number): number {
  if (!Number.isFinite(pressurePa) || pressurePa <= 0)
    throw new RangeError(`Pressure must be > 0 Pa, got ${pressurePa}`);
  const { A, B, C } = METHANOL_ANTOINE;
  return B / (A - Math.log10(pressurePa / PA_PER_BAR)) - C - KELVIN_OFFSET;
}

/**
 * Methanol's boiling point at an elevation: the CRC Handbook's 64.7 °C at 1 atm, lowered by
 * the difference the NIST Antoine equation gives between 1 atm and the standard pressure at
 * that elevation (barometric formula). Anchoring at the CRC value keeps sea level at exactly
 * 64.7 °C; the Antoine equation alone gives 64.55 °C there.
 * @param elevationM elevation above sea level, m (default 0)
 * @returns boiling point, °C (0 m → 64.7; 1 600 m ≈ 59.9)
 */
export function methanolBoilingPointC(elevationM = 0): number {
  const seaLevel = methanolAntoineBoilingC(STANDARD_ATMOSPHERE.seaLevelPa);
  return METHANOL_BOILING_POINT_C + (methanolAntoineBoilingC(pressureAtElevationPa(elevationM)) - seaLevel);
}
