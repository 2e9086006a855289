import type { QualityLimit } from './standards';

// ASTM D6751 (B100) limits, one row per property (and grade where No. 1-B differs); lib/quality/limits.ts
// joins them with the EN 14214 rows.

const D6751 = 'ASTM D6751-24, Table 1'; // current edition at the time of writing (edition label from memory: not found in a public document)

/**
 * Public summaries the completing rows were checked against (values, not the standard's text):
 * - https://www.scribd.com/document/410725514/prousbio (ASTM D6751-09 table; the -07b one at
 *   https://www.scribd.com/document/522190247/ASTM-6751-Spec gives the same values, without cold soak);
 * - http://gorgeanalytical.com/tag/astm-d7501/ (cold soak ≤ 360 s; No. 1-B ≤ 200 s with monoglycerides ≤ 0.40 %),
 *   https://www.truckinginfo.com/108643/industry-sets-new-biodiesel-standards (No. 1-B is new; No. 2-B keeps the old values).
 * NREL's Biodiesel Handling and Use Guide table was not among the stored pages searched.
 */
const ASTM_09_SUMMARY = 'public summary table "Specification for biodiesel (B100) – ASTM D6751-09" (Nov. 2008)';
const ASTM_1B_SUMMARY = "a fuel-testing laboratory's public note on ASTM D7501 cold soak filtration in ASTM D6751 (No. 1-B: ≤ 200 s, monoglycerides ≤ 0.40 % mass)";

/** ASTM D6751 rows: those of /work/shared/REFERENCES.md first, then the rest of Table 1 (see QUALITY_LIMITS). */
export const ASTM_D6751_LIMITS: readonly QualityLimit[] = [
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
];

/** Sulfur limit of ASTM D6751 grade S500, ppm. */
export const ASTM_S500_SULFUR_MAX_PPM = 500; // ASTM D6751 grade S500
