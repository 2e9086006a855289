import type { QualityLimit } from './standards';

// EN 14214 (FAME) limits, one row per property; lib/quality/limits.ts joins them with the ASTM D6751 rows.

// Edition confirmed by a standards catalogue listing "BS EN 14214:2012+A2:2019", whose summary also names the 2012
// changes (oxidation stability 6 → 8 h, monoglycerides 0.8 → 0.7 %).
const EN = 'EN 14214:2012+A2:2019, Table 1';

/**
 * Public summaries the completing rows were checked against (values, not the standard's text):
 * - https://www.mabalive.co.uk/products/fame (EN 14214:2012+A1:2014 table: every completing row);
 * - https://plusstd.com/standard/1948674917/bs-en-14214-2012-a2-2019/ (the A2:2019 edition; 2012 changes).
 */
const EN_14_SUMMARY = 'public product specification table "FAME EN 14214:2012+A1:2014" (a fuel supplier\'s)';

/** EN 14214 rows: those of /work/shared/REFERENCES.md first, then the rest of Table 1 (see QUALITY_LIMITS). */
export const EN_14214_LIMITS: readonly QualityLimit[] = [
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
