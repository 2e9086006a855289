/** The fuel standards the app compares lab results with. */
export type FuelStandard = 'ASTM D6751' | 'EN 14214';

/** All standards, e.g. for a select. */
export const FUEL_STANDARDS: readonly FuelStandard[] = ['ASTM D6751', 'EN 14214'];

/** ASTM D6751 grades: No. 1-B adds cold soak filtration ≤ 200 s and monoglycerides ≤ 0.40 % (for cold use). */
export type AstmGrade = '1-B' | '2-B';

/** Properties with a limit in at least one standard (keys of a lab-results record). */
export const QUALITY_PROPERTIES = [
  'acidNumber', 'freeGlycerin', 'totalGlycerin', 'waterAndSediment', 'water', 'flashPoint', 'methanol', 'kinematicViscosity40C',
  'sulfur', 'cloudPoint', 'oxidationStability', 'sulfatedAsh', 'copperStripCorrosion', 'cetaneNumber', 'carbonResidue', 'density15C',
  'sodiumPotassium', 'calciumMagnesium', 'phosphorus', 'distillationT90', 'coldSoakFiltration', 'monoglycerides',
  'esterContent', 'totalContamination', 'diglycerides', 'triglycerides', 'linolenicMethylEster', 'polyunsaturatedMethylEster',
  'iodineValue',
] as const;
export type QualityProperty = (typeof QUALITY_PROPERTIES)[number];

/** One row of the B100 limits table. */
export interface QualityLimit {
  standard: FuelStandard;
  property: QualityProperty;
  label: string;
  unit: string;
  min?: number;
  max?: number;
  /** The limit as printed on a record. */
  limitText: string;
  /** Test method the standard names for the property. */
  method: string;
  /** Where the row comes from: standard, table, and the edition when values changed between editions. */
  source: string;
  /** The standard only asks for the value to be reported (no pass/fail limit). */
  reportOnly?: boolean;
  /** A result is needed for a "meets" verdict (false only for nationally set rows). */
  required: boolean;
  /** Only for this ASTM D6751 grade (both grades when absent). */
  astmGrade?: AstmGrade;
  /** Another way to meet the requirement: this property at or above `min`. */
  alternative?: { property: QualityProperty; min: number; text: string };
  /** The value is recalled from memory, not checked against the standard's text or a public summary of it. */
  fromMemory?: boolean;
  /** The public document (a summary of the standard's table) the value was checked against. */
  checkedAgainst?: string;
  note?: string;
}

const D6751 = 'ASTM D6751-24, Table 1'; // current edition at the time of writing (edition label from memory: not found in a public document)
// Edition confirmed by a standards catalogue listing "BS EN 14214:2012+A2:2019", whose summary also names the 2012
// changes (oxidation stability 6 → 8 h, monoglycerides 0.8 → 0.7 %).
const EN = 'EN 14214:2012+A2:2019, Table 1';

/**
 * Public summaries the completing rows were checked against (values, not the standards' text):
 * - https://www.scribd.com/document/410725514/prousbio (ASTM D6751-09 table; the -07b one at
 *   https://www.scribd.com/document/522190247/ASTM-6751-Spec gives the same values, without cold soak);
 * - http://gorgeanalytical.com/tag/astm-d7501/ (cold soak ≤ 360 s; No. 1-B ≤ 200 s with monoglycerides ≤ 0.40 %),
 *   https://www.truckinginfo.com/108643/industry-sets-new-biodiesel-standards (No. 1-B is new; No. 2-B keeps the old values);
 * - https://www.mabalive.co.uk/products/fame (EN 14214:2012+A1:2014 table: every EN row below it);
 * - https://plusstd.com/standard/1948674917/bs-en-14214-2012-a2-2019/ (the A2:2019 edition; 2012 changes).
 * NREL's Biodiesel Handling and Use Guide table was not among the stored pages searched.
 */
const ASTM_09_SUMMARY = 'public summary table "Specification for biodiesel (B100) – ASTM D6751-09" (Nov. 2008)';
const ASTM_1B_SUMMARY = "a fuel-testing laboratory's public note on ASTM D7501 cold soak filtration in ASTM D6751 (No. 1-B: ≤ 200 s, monoglycerides ≤ 0.40 % mass)";
const EN_14_SUMMARY = 'public product specification table "FAME EN 14214:2012+A1:2014" (a fuel supplier\'s)';

/**
 * Finished fuel (B100) limits. The first rows of each standard are those in
 * /work/shared/REFERENCES.md "Finished fuel limits (B100)"; the rows after them complete the
 * standards' tables and name the public summary they were checked against (`checkedAgainst`); a
 * value no public document confirmed is marked `fromMemory`. Every row names its source, and its edition
 * where values changed between editions.
 */
export const QUALITY_LIMITS: readonly QualityLimit[] = [
  // ASTM D6751 — REFERENCES.md rows
  { standard: 'ASTM D6751', property: 'acidNumber', label: 'Acid number', unit: 'mg KOH/g', max: 0.5, limitText: '≤ 0.50 mg KOH/g', method: 'ASTM D664', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'freeGlycerin', label: 'Free glycerin', unit: '% mass', max: 0.02, limitText: '≤ 0.020 % mass', method: 'ASTM D6584', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'totalGlycerin', label: 'Total glycerin', unit: '% mass', max: 0.24, limitText: '≤ 0.240 % mass', method: 'ASTM D6584', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'waterAndSediment', label: 'Water and sediment', unit: '% volume', max: 0.05, limitText: '≤ 0.050 % volume', method: 'ASTM D2709', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'flashPoint', label: 'Flash point (closed cup)', unit: '°C', min: 93, limitText: '≥ 93 °C', method: 'ASTM D93', source: D6751, required: true },
  {
    standard: 'ASTM D6751', property: 'methanol', label: 'Methanol content', unit: '% mass', max: 0.2, limitText: '≤ 0.2 % mass or flash point ≥ 130 °C', method: 'EN 14110', source: D6751, required: true,
    alternative: { property: 'flashPoint', min: 130, text: 'flash point ≥ 130 °C' }, // ASTM D6751 alcohol control
  },
  { standard: 'ASTM D6751', property: 'kinematicViscosity40C', label: 'Kinematic viscosity at 40 °C', unit: 'mm²/s', min: 1.9, max: 6.0, limitText: '1.9–6.0 mm²/s', method: 'ASTM D445', source: D6751, required: true },
  {
    standard: 'ASTM D6751', property: 'sulfur', label: 'Sulfur', unit: 'ppm', max: 15, limitText: '≤ 15 ppm (grade S15)', method: 'ASTM D5453', source: D6751, required: true,
    note: 'Grade S500 allows ≤ 500 ppm.', // ASTM D6751 grade S500
  },
  { standard: 'ASTM D6751', property: 'cloudPoint', label: 'Cloud point', unit: '°C', limitText: 'report', reportOnly: true, method: 'ASTM D2500', source: D6751, required: true },
  {
    standard: 'ASTM D6751', property: 'oxidationStability', label: 'Oxidation stability (110 °C)', unit: 'h', min: 3, limitText: '≥ 3 h', method: 'EN 15751', source: D6751, required: true,
  },
  { standard: 'ASTM D6751', property: 'sulfatedAsh', label: 'Sulfated ash', unit: '% mass', max: 0.02, limitText: '≤ 0.020 % mass', method: 'ASTM D874', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'copperStripCorrosion', label: 'Copper strip corrosion', unit: 'class No.', max: 3, limitText: '≤ No. 3', method: 'ASTM D130', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'cetaneNumber', label: 'Cetane number', unit: '', min: 47, limitText: '≥ 47', method: 'ASTM D613', source: D6751, required: true },
  { standard: 'ASTM D6751', property: 'carbonResidue', label: 'Carbon residue', unit: '% mass', max: 0.05, limitText: '≤ 0.050 % mass', method: 'ASTM D4530', source: D6751, required: true },
  // ASTM D6751 — completing Table 1 (values checked against a public summary of the -09 edition)
  { standard: 'ASTM D6751', property: 'sodiumPotassium', label: 'Sodium and potassium, combined', unit: 'ppm (µg/g)', max: 5, limitText: '≤ 5 ppm', method: 'EN 14538', source: D6751, required: true, checkedAgainst: ASTM_09_SUMMARY },
  { standard: 'ASTM D6751', property: 'calciumMagnesium', label: 'Calcium and magnesium, combined', unit: 'ppm (µg/g)', max: 5, limitText: '≤ 5 ppm', method: 'EN 14538', source: D6751, required: true, checkedAgainst: ASTM_09_SUMMARY },
  { standard: 'ASTM D6751', property: 'phosphorus', label: 'Phosphorus', unit: '% mass', max: 0.001, limitText: '≤ 0.001 % mass (10 ppm)', method: 'ASTM D4951', source: D6751, required: true, checkedAgainst: ASTM_09_SUMMARY },
  { standard: 'ASTM D6751', property: 'distillationT90', label: 'Distillation temperature, 90 % recovered (AET)', unit: '°C', max: 360, limitText: '≤ 360 °C', method: 'ASTM D1160', source: D6751, required: true, checkedAgainst: ASTM_09_SUMMARY },
  {
    standard: 'ASTM D6751', property: 'coldSoakFiltration', label: 'Cold soak filtration', unit: 's', max: 360, limitText: '≤ 360 s (grade No. 2-B)', method: 'ASTM D7501', astmGrade: '2-B',
    source: `${D6751}; first required in ASTM D6751-08 (edition from memory)`, required: true, checkedAgainst: ASTM_09_SUMMARY,
  },
  {
    standard: 'ASTM D6751', property: 'coldSoakFiltration', label: 'Cold soak filtration', unit: 's', max: 200, limitText: '≤ 200 s (grade No. 1-B, for cold use)', method: 'ASTM D7501', astmGrade: '1-B',
    // ≤ 200 s "for use in temperatures below −12 °C" already in the -09 summary; the grade's name came with D6751-12 (its scope lists grades No. 1-B and 2-B).
    source: `${D6751}; grade No. 1-B added in ASTM D6751-12`, required: true, checkedAgainst: `${ASTM_09_SUMMARY}; ${ASTM_1B_SUMMARY}`,
  },
  {
    standard: 'ASTM D6751', property: 'monoglycerides', label: 'Monoglycerides', unit: '% mass', max: 0.4, limitText: '≤ 0.40 % mass (grade No. 1-B)', method: 'ASTM D6584', astmGrade: '1-B',
    source: `${D6751}; grade No. 1-B added in ASTM D6751-12`, required: true, checkedAgainst: ASTM_1B_SUMMARY,
  },

  // EN 14214 — REFERENCES.md rows
  { standard: 'EN 14214', property: 'acidNumber', label: 'Acid value', unit: 'mg KOH/g', max: 0.5, limitText: '≤ 0.50 mg KOH/g', method: 'EN 14104', source: EN, required: true },
  { standard: 'EN 14214', property: 'freeGlycerin', label: 'Free glycerol', unit: '% m/m', max: 0.02, limitText: '≤ 0.02 % m/m', method: 'EN 14105', source: EN, required: true },
  {
    standard: 'EN 14214', property: 'totalGlycerin', label: 'Total glycerol', unit: '% m/m', max: 0.25, limitText: '≤ 0.25 % m/m', method: 'EN 14105', source: EN, required: true, // EN 14214 (from memory)
    // Not in the public EN 14214:2012+A1:2014 table checked for the other rows, so it stays "from memory".
    fromMemory: true, note: 'Limit recalled from memory; check against the current edition of EN 14214.',
  },
  { standard: 'EN 14214', property: 'water', label: 'Water content', unit: 'mg/kg', max: 500, limitText: '≤ 500 mg/kg', method: 'EN ISO 12937', source: EN, required: true },
  { standard: 'EN 14214', property: 'flashPoint', label: 'Flash point', unit: '°C', min: 101, limitText: '≥ 101 °C', method: 'EN ISO 3679', source: EN, required: true },
  { standard: 'EN 14214', property: 'methanol', label: 'Methanol content', unit: '% m/m', max: 0.2, limitText: '≤ 0.20 % m/m', method: 'EN 14110', source: EN, required: true },
  { standard: 'EN 14214', property: 'kinematicViscosity40C', label: 'Kinematic viscosity at 40 °C', unit: 'mm²/s', min: 3.5, max: 5.0, limitText: '3.50–5.00 mm²/s', method: 'EN ISO 3104', source: EN, required: true },
  { standard: 'EN 14214', property: 'sulfur', label: 'Sulfur', unit: 'mg/kg', max: 10, limitText: '≤ 10.0 mg/kg', method: 'EN ISO 20846', source: EN, required: true },
  {
    standard: 'EN 14214', property: 'cloudPoint', label: 'Cloud point', unit: '°C', limitText: 'national classes', reportOnly: true, method: 'EN 23015', source: EN, required: false,
    note: 'Cold-weather limits are set by national climate classes and are not checked here.',
  },
  {
    standard: 'EN 14214', property: 'oxidationStability', label: 'Oxidation stability (110 °C)', unit: 'h', min: 8, limitText: '≥ 8.0 h', method: 'EN 14112 / EN 15751', required: true,
    source: `${EN}; ≥ 6.0 h before EN 14214:2012`, checkedAgainst: EN_14_SUMMARY,
  },
  { standard: 'EN 14214', property: 'sulfatedAsh', label: 'Sulfated ash', unit: '% m/m', max: 0.02, limitText: '≤ 0.02 % m/m', method: 'ISO 3987', source: EN, required: true },
  { standard: 'EN 14214', property: 'copperStripCorrosion', label: 'Copper strip corrosion (3 h, 50 °C)', unit: 'class', max: 1, limitText: 'class 1', method: 'EN ISO 2160', source: EN, required: true },
  { standard: 'EN 14214', property: 'cetaneNumber', label: 'Cetane number', unit: '', min: 51, limitText: '≥ 51.0', method: 'EN ISO 5165', source: EN, required: true },
  { standard: 'EN 14214', property: 'density15C', label: 'Density at 15 °C', unit: 'kg/m³', min: 860, max: 900, limitText: '860–900 kg/m³', method: 'EN ISO 12185', source: EN, required: true },
  // EN 14214 — completing Table 1 (values checked against a public table of EN 14214:2012+A1:2014)
  { standard: 'EN 14214', property: 'esterContent', label: 'FAME (ester) content', unit: '% m/m', min: 96.5, limitText: '≥ 96.5 % m/m', method: 'EN 14103', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  { standard: 'EN 14214', property: 'totalContamination', label: 'Total contamination', unit: 'mg/kg', max: 24, limitText: '≤ 24 mg/kg', method: 'EN 12662', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  {
    standard: 'EN 14214', property: 'monoglycerides', label: 'Monoglyceride content', unit: '% m/m', max: 0.7, limitText: '≤ 0.70 % m/m', method: 'EN 14105', required: true, checkedAgainst: EN_14_SUMMARY,
    source: `${EN}; ≤ 0.80 % m/m before EN 14214:2012`,
  },
  { standard: 'EN 14214', property: 'diglycerides', label: 'Diglyceride content', unit: '% m/m', max: 0.2, limitText: '≤ 0.20 % m/m', method: 'EN 14105', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  { standard: 'EN 14214', property: 'triglycerides', label: 'Triglyceride content', unit: '% m/m', max: 0.2, limitText: '≤ 0.20 % m/m', method: 'EN 14105', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  { standard: 'EN 14214', property: 'linolenicMethylEster', label: 'Linolenic acid methyl ester', unit: '% m/m', max: 12, limitText: '≤ 12.0 % m/m', method: 'EN 14103', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  { standard: 'EN 14214', property: 'polyunsaturatedMethylEster', label: 'Polyunsaturated (≥ 4 double bonds) methyl esters', unit: '% m/m', max: 1, limitText: '≤ 1.00 % m/m', method: 'EN 15779', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  { standard: 'EN 14214', property: 'iodineValue', label: 'Iodine value', unit: 'g iodine/100 g', max: 120, limitText: '≤ 120', method: 'EN 14111', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  {
    standard: 'EN 14214', property: 'phosphorus', label: 'Phosphorus content', unit: 'mg/kg', max: 4, limitText: '≤ 4.0 mg/kg', method: 'EN 14107', required: true, checkedAgainst: EN_14_SUMMARY,
    source: `${EN}; ≤ 10.0 mg/kg before EN 14214:2012 (earlier value from memory)`,
  },
  { standard: 'EN 14214', property: 'sodiumPotassium', label: 'Group I metals (Na + K)', unit: 'mg/kg', max: 5, limitText: '≤ 5.0 mg/kg', method: 'EN 14538', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
  { standard: 'EN 14214', property: 'calciumMagnesium', label: 'Group II metals (Ca + Mg)', unit: 'mg/kg', max: 5, limitText: '≤ 5.0 mg/kg', method: 'EN 14538', source: EN, required: true, checkedAgainst: EN_14_SUMMARY },
];

/** Sulfur limit of ASTM D6751 grade S500, ppm. */
export const ASTM_S500_SULFUR_MAX_PPM = 500; // ASTM D6751 grade S500

/**
 * The limit rows of one standard, in table order (for ASTM D6751, of one grade; No. 2-B by default).
 * @param standard 'ASTM D6751' or 'EN 14214'
 * @param astmGrade ASTM D6751 grade, '2-B' unless the fuel is for cold use ('1-B')
 * @returns the rows of that standard
 */
export function limitsFor(standard: FuelStandard, astmGrade: AstmGrade = '2-B'): QualityLimit[] {
  return QUALITY_LIMITS.filter((row) => row.standard === standard && (row.astmGrade === undefined || row.astmGrade === astmGrade));
}
