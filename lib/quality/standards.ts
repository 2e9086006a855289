// The standards' vocabulary: which standards, grades and properties a limits row can name, and
// the row's shape. The rows themselves are per standard (astm-d6751.ts, en-14214.ts).

/** The fuel standards the app compares lab results with. */
export type FuelStandard = 'ASTM D6751' | 'EN 14214';

/** All standards, e.g. for a select. */
export const FUEL_STANDARDS: readonly FuelStandard[] = ['ASTM D6751', 'EN 14214'];

/** ASTM D6751 grades: No. 1-B adds cold soak filtration ≤ 200 s and monoglycerides ≤ 0.40 % (for cold use). */
export type AstmGrade = '1-B' | '2-B';

/** Properties with a limit in at least one standard (keys of a lab-results record). */
export const QUALITY_PROPERTIES = [
  'acidNumber',
  'freeGlycerin',
  'totalGlycerin',
  'waterAndSediment',
  'water',
  'flashPoint',
  'methanol',
  'kinematicViscosity40C',
  'sulfur',
  'cloudPoint',
  'oxidationStability',
  'sulfatedAsh',
  'copperStripCorrosion',
  'cetaneNumber',
  'carbonResidue',
  'density15C',
  'sodiumPotassium',
  'calciumMagnesium',
  'phosphorus',
  'distillationT90',
  'coldSoakFiltration',
  'monoglycerides',
  'esterContent',
  'totalContamination',
  'diglycerides',
  'triglycerides',
  'linolenicMethylEster',
  'polyunsaturatedMethylEster',
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
