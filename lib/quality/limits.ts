/** The fuel standards the app compares lab results with. */
export type FuelStandard = 'ASTM D6751' | 'EN 14214';

/** All standards, e.g. for a select. */
export const FUEL_STANDARDS: readonly FuelStandard[] = ['ASTM D6751', 'EN 14214'];

/** Properties with a limit in at least one standard (keys of a lab-results record). */
export type QualityProperty =
  | 'acidNumber'
  | 'freeGlycerin'
  | 'totalGlycerin'
  | 'waterAndSediment'
  | 'water'
  | 'flashPoint'
  | 'methanol'
  | 'kinematicViscosity40C'
  | 'sulfur'
  | 'cloudPoint'
  | 'oxidationStability'
  | 'sulfatedAsh'
  | 'copperStripCorrosion'
  | 'cetaneNumber'
  | 'carbonResidue'
  | 'density15C';

/** One row of the B100 limits table. */
export interface QualityLimit {
  standard: FuelStandard;
  property: QualityProperty;
  label: string;
  unit: string;
  min?: number;
  max?: number;
  /** The limit as printed on a certificate. */
  limitText: string;
  /** The standard only asks for the value to be reported (no pass/fail limit). */
  reportOnly?: boolean;
  /** Another way to meet the requirement: this property at or above `min`. */
  alternative?: { property: QualityProperty; min: number; text: string };
  /** The value in REFERENCES.md is recalled from memory, not checked against the standard's text. */
  fromMemory?: boolean;
  note?: string;
}

/**
 * Finished fuel (B100) limits per /work/shared/REFERENCES.md "Finished fuel limits (B100)".
 * Every row cites its standard in the `standard` field.
 */
export const QUALITY_LIMITS: readonly QualityLimit[] = [
  // ASTM D6751
  { standard: 'ASTM D6751', property: 'acidNumber', label: 'Acid number', unit: 'mg KOH/g', max: 0.5, limitText: '≤ 0.50 mg KOH/g' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'freeGlycerin', label: 'Free glycerin', unit: '% mass', max: 0.02, limitText: '≤ 0.020 % mass' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'totalGlycerin', label: 'Total glycerin', unit: '% mass', max: 0.24, limitText: '≤ 0.240 % mass' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'waterAndSediment', label: 'Water and sediment', unit: '% volume', max: 0.05, limitText: '≤ 0.050 % volume' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'flashPoint', label: 'Flash point', unit: '°C', min: 93, limitText: '≥ 93 °C' }, // ASTM D6751
  {
    standard: 'ASTM D6751', property: 'methanol', label: 'Methanol content', unit: '% mass', max: 0.2, limitText: '≤ 0.2 % mass or flash point ≥ 130 °C', // ASTM D6751
    alternative: { property: 'flashPoint', min: 130, text: 'flash point ≥ 130 °C' }, // ASTM D6751
  },
  { standard: 'ASTM D6751', property: 'kinematicViscosity40C', label: 'Kinematic viscosity at 40 °C', unit: 'mm²/s', min: 1.9, max: 6.0, limitText: '1.9–6.0 mm²/s' }, // ASTM D6751
  {
    standard: 'ASTM D6751', property: 'sulfur', label: 'Sulfur', unit: 'ppm', max: 15, limitText: '≤ 15 ppm (grade S15)', // ASTM D6751 grade S15
    note: 'Grade S500 allows ≤ 500 ppm.', // ASTM D6751 grade S500
  },
  { standard: 'ASTM D6751', property: 'cloudPoint', label: 'Cloud point', unit: '°C', limitText: 'report', reportOnly: true }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'oxidationStability', label: 'Oxidation stability (110 °C)', unit: 'h', min: 3, limitText: '≥ 3 h' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'sulfatedAsh', label: 'Sulfated ash', unit: '% mass', max: 0.02, limitText: '≤ 0.020 % mass' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'copperStripCorrosion', label: 'Copper strip corrosion', unit: 'class No.', max: 3, limitText: '≤ No. 3' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'cetaneNumber', label: 'Cetane number', unit: '', min: 47, limitText: '≥ 47' }, // ASTM D6751
  { standard: 'ASTM D6751', property: 'carbonResidue', label: 'Carbon residue', unit: '% mass', max: 0.05, limitText: '≤ 0.050 % mass' }, // ASTM D6751

  // EN 14214
  { standard: 'EN 14214', property: 'acidNumber', label: 'Acid value', unit: 'mg KOH/g', max: 0.5, limitText: '≤ 0.50 mg KOH/g' }, // EN 14214
  { standard: 'EN 14214', property: 'freeGlycerin', label: 'Free glycerol', unit: '% m/m', max: 0.02, limitText: '≤ 0.02 % m/m' }, // EN 14214
  {
    standard: 'EN 14214', property: 'totalGlycerin', label: 'Total glycerol', unit: '% m/m', max: 0.25, limitText: '≤ 0.25 % m/m', // EN 14214 (from memory)
    fromMemory: true, note: 'Limit recalled from memory; check against the current edition of EN 14214.',
  },
  { standard: 'EN 14214', property: 'water', label: 'Water content', unit: 'mg/kg', max: 500, limitText: '≤ 500 mg/kg' }, // EN 14214
  { standard: 'EN 14214', property: 'flashPoint', label: 'Flash point', unit: '°C', min: 101, limitText: '≥ 101 °C' }, // EN 14214
  { standard: 'EN 14214', property: 'methanol', label: 'Methanol content', unit: '% m/m', max: 0.2, limitText: '≤ 0.20 % m/m' }, // EN 14214
  { standard: 'EN 14214', property: 'kinematicViscosity40C', label: 'Kinematic viscosity at 40 °C', unit: 'mm²/s', min: 3.5, max: 5.0, limitText: '3.50–5.00 mm²/s' }, // EN 14214
  { standard: 'EN 14214', property: 'sulfur', label: 'Sulfur', unit: 'mg/kg', max: 10, limitText: '≤ 10.0 mg/kg' }, // EN 14214
  {
    standard: 'EN 14214', property: 'cloudPoint', label: 'Cloud point', unit: '°C', limitText: 'national classes', reportOnly: true, // EN 14214
    note: 'Cold-weather limits are set by national climate classes.',
  },
  { standard: 'EN 14214', property: 'oxidationStability', label: 'Oxidation stability (110 °C)', unit: 'h', min: 8, limitText: '≥ 8.0 h' }, // EN 14214
  { standard: 'EN 14214', property: 'sulfatedAsh', label: 'Sulfated ash', unit: '% m/m', max: 0.02, limitText: '≤ 0.02 % m/m' }, // EN 14214
  { standard: 'EN 14214', property: 'copperStripCorrosion', label: 'Copper strip corrosion', unit: 'class', max: 1, limitText: 'class 1' }, // EN 14214
  { standard: 'EN 14214', property: 'cetaneNumber', label: 'Cetane number', unit: '', min: 51, limitText: '≥ 51.0' }, // EN 14214
  { standard: 'EN 14214', property: 'density15C', label: 'Density at 15 °C', unit: 'kg/m³', min: 860, max: 900, limitText: '860–900 kg/m³' }, // EN 14214
];

/** Sulfur limit of ASTM D6751 grade S500, ppm. */
export const ASTM_S500_SULFUR_MAX_PPM = 500; // ASTM D6751 grade S500

/**
 * The limit rows of one standard, in table order.
 * @param standard 'ASTM D6751' or 'EN 14214'
 * @returns the rows of that standard
 */
export function limitsFor(standard: FuelStandard): QualityLimit[] {
  return QUALITY_LIMITS.filter((row) => row.standard === standard);
}
