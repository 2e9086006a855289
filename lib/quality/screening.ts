/** Shown wherever the app shows a quality verdict. */
export const SCREENING_CAUTION =
  'Home quick tests are screening only; no home test proves compliance with ASTM D6751 or EN 14214.'; // REFERENCES.md (common practice)

/** Molar mass of the soap a catalyst forms with oleic acid, g/mol (sodium / potassium oleate). */
export const SOAP_MOLAR_MASS_G_PER_MOL = {
  NaOH: 304.44, // sodium oleate C18H33NaO2, IUPAC standard atomic weights
  KOH: 320.55, // potassium oleate C18H33KO2, IUPAC standard atomic weights
} as const;

/** Molar mass of the alkali metal each catalyst brings, g/mol. */
export const ALKALI_METAL_MOLAR_MASS_G_PER_MOL = {
  NaOH: 22.99, // sodium, IUPAC standard atomic weights
  KOH: 39.098, // potassium, IUPAC standard atomic weights
} as const;

/** ASTM D6751 limit for sodium and potassium combined, ppm (µg/g). */
export const ASTM_NA_K_MAX_PPM = 5; // ASTM D6751 (Na + K ≤ 5 ppm, EN 14538; from memory)

/**
 * Soap level (ppm as the catalyst's oleate) at which the soap alone carries as much sodium or
 * potassium as ASTM D6751 allows (Na + K ≤ 5 ppm). Every mole of soap carries one mole of the
 * metal, so ppm soap = 5 ppm × M(oleate) ÷ M(metal):
 *   sodium oleate:    5 × 304.44 / 22.990 ≈ 66.2 ppm
 *   potassium oleate: 5 × 320.55 / 39.098 ≈ 41.0 ppm
 * Above it the fuel cannot meet the Na + K limit, so the soap test needs attention.
 */
export const SOAP_ATTENTION_PPM = {
  NaOH: (ASTM_NA_K_MAX_PPM * SOAP_MOLAR_MASS_G_PER_MOL.NaOH) / ALKALI_METAL_MOLAR_MASS_G_PER_MOL.NaOH, // ≈ 66 (ASTM D6751 with IUPAC molar masses)
  KOH: (ASTM_NA_K_MAX_PPM * SOAP_MOLAR_MASS_G_PER_MOL.KOH) / ALKALI_METAL_MOLAR_MASS_G_PER_MOL.KOH, // ≈ 41 (ASTM D6751 with IUPAC molar masses)
} as const;

/** Normality of the hydrochloric acid used in the soap titration. */
export const SOAP_TITRANT_NORMALITY = 0.01; // common practice (0.01 N HCl to bromophenol blue)

/** Status of one screening test. Never 'pass': a home test cannot pass a fuel. */
export type ScreeningStatus = 'looks-good' | 'needs-attention' | 'recorded' | 'not tested';

/** The home quick tests recorded for a batch; omit a test that was not done. */
export interface QuickTestInput {
  /** 3/27 test: 3 mL fuel in 27 mL methanol, shaken. */
  test327?: { result: 'clear' | 'fallout'; falloutMl?: number };
  /** Soap titration with 0.01 N HCl to bromophenol blue. */
  soap?: { hclMl: number; sampleGrams: number; catalyst: 'NaOH' | 'KOH' };
  /** Shake (wash) test. */
  washTest?: 'clean-split' | 'emulsion';
  /** Visual check after drying (not a water measurement). */
  water?: 'clear' | 'hazy';
}

export type QuickTestKey = keyof QuickTestInput;

/** One evaluated quick test. */
export interface QuickTestResult {
  test: QuickTestKey;
  label: string;
  status: ScreeningStatus;
  detail: string;
  /** Soap test only: soap, ppm as sodium or potassium oleate. */
  soapPpm?: number;
}

/** Result of {@link evaluateQuickTests}. */
export interface QuickTestEvaluation {
  items: QuickTestResult[];
  /** 'needs-attention' if any test does; 'looks-good' if all four were done and none does (still screening only); otherwise 'incomplete'. */
  overall: 'looks-good' | 'needs-attention' | 'incomplete';
  caution: typeof SCREENING_CAUTION;
}

const LABELS: Record<QuickTestKey, string> = {
  test327: '3/27 methanol test',
  soap: 'Soap titration',
  washTest: 'Shake (wash) test',
  water: 'Appearance after drying (visual)',
};

/**
 * Soap content from a titration with 0.01 N HCl:
 * ppm = mL × N × M(soap) × 1000 ÷ g of sample (soap as sodium or potassium oleate).
 * @param hclMl 0.01 N HCl used, mL
 * @param sampleGrams fuel sample, g
 * @param catalyst catalyst used in the batch (decides which soap)
 * @returns soap, ppm by mass
 */
export function soapPpm(hclMl: number, sampleGrams: number, catalyst: 'NaOH' | 'KOH'): number {
  if (!Number.isFinite(hclMl) || hclMl < 0) throw new RangeError(`HCl volume must be ≥ 0 mL, got ${hclMl}`);
  if (!Number.isFinite(sampleGrams) || sampleGrams <= 0)
    throw new RangeError(`Sample mass must be > 0 g, got ${sampleGrams}`);
  return (hclMl * SOAP_TITRANT_NORMALITY * SOAP_MOLAR_MASS_G_PER_MOL[catalyst] * 1000) / sampleGrams;
}

/**
 * Evaluates the home quick tests as screening results:
 * - 3/27 clear → looks good, fall-out → unreacted glycerides (common practice reading);
 * - wash test clean split → little soap, emulsion → soap (common practice reading);
 * - soap titration in ppm as the catalyst's oleate; above the level equivalent to ASTM D6751's
 *   Na + K ≤ 5 ppm ({@link SOAP_ATTENTION_PPM}: ≈ 66 ppm sodium oleate, ≈ 41 ppm potassium
 *   oleate) it needs attention;
 * - appearance after drying: hazy → needs attention; clear is recorded as a visual check, never
 *   as a water result (clear fuel can hold far more than 500 ppm dissolved water).
 * @param input the tests done
 * @returns one item per test (untested ones as 'not tested'), an overall status and the caution text
 */
export function evaluateQuickTests(input: QuickTestInput): QuickTestEvaluation {
  const items: QuickTestResult[] = [];

  if (input.test327) {
    const { result, falloutMl } = input.test327;
    if (falloutMl !== undefined && (!Number.isFinite(falloutMl) || falloutMl < 0)) {
      throw new RangeError(`Fall-out volume must be ≥ 0 mL, got ${falloutMl}`);
    }
    items.push(
      result === 'clear'
        ? { test: 'test327', label: LABELS.test327, status: 'looks-good', detail: 'Clear: suggests good conversion.' }
        : {
            test: 'test327',
            label: LABELS.test327,
            status: 'needs-attention',
            detail: `Fall-out${falloutMl !== undefined ? ` of ${falloutMl} mL` : ''}: unreacted glycerides — conversion looks incomplete.`,
          },
    );
  } else {
    items.push({ test: 'test327', label: LABELS.test327, status: 'not tested', detail: 'Not tested.' });
  }

  if (input.soap) {
    const ppm = soapPpm(input.soap.hclMl, input.soap.sampleGrams, input.soap.catalyst);
    const soapName = input.soap.catalyst === 'NaOH' ? 'sodium oleate' : 'potassium oleate';
    const metal = input.soap.catalyst === 'NaOH' ? 'sodium' : 'potassium';
    const limit = SOAP_ATTENTION_PPM[input.soap.catalyst];
    const over = ppm > limit;
    items.push({
      test: 'soap',
      label: LABELS.soap,
      status: over ? 'needs-attention' : 'recorded',
      detail: over
        ? `${Math.round(ppm)} ppm soap as ${soapName}: above ${Math.round(limit)} ppm, where the soap alone carries more ${metal} than ASTM D6751 allows (Na + K ≤ 5 ppm) — wash again.`
        : `${Math.round(ppm)} ppm soap as ${soapName}: at or below ${Math.round(limit)} ppm, the level equivalent to ASTM D6751's Na + K ≤ 5 ppm.`,
      soapPpm: ppm,
    });
  } else {
    items.push({ test: 'soap', label: LABELS.soap, status: 'not tested', detail: 'Not tested.' });
  }

  if (input.washTest) {
    items.push(
      input.washTest === 'clean-split'
        ? { test: 'washTest', label: LABELS.washTest, status: 'looks-good', detail: 'Clean, quick split: little soap.' }
        : {
            test: 'washTest',
            label: LABELS.washTest,
            status: 'needs-attention',
            detail: 'Emulsion: soap or unreacted oil present.',
          },
    );
  } else {
    items.push({ test: 'washTest', label: LABELS.washTest, status: 'not tested', detail: 'Not tested.' });
  }

  if (input.water) {
    items.push(
      input.water === 'clear'
        ? {
            test: 'water',
            label: LABELS.water,
            status: 'recorded',
            detail:
              'Clear to the eye. A visual check only, not a water result: clear fuel can hold well over 500 ppm of dissolved water; only a laboratory test (e.g. EN ISO 12937 or ASTM D2709) measures it.',
          }
        : {
            test: 'water',
            label: LABELS.water,
            status: 'needs-attention',
            detail:
              'Hazy: free water still present — dry further (a laboratory test measures water; EN 14214 allows ≤ 500 mg/kg).',
          },
    );
  } else {
    items.push({ test: 'water', label: LABELS.water, status: 'not tested', detail: 'Not tested.' });
  }

  const overall = items.some((i) => i.status === 'needs-attention')
    ? 'needs-attention'
    : items.every((i) => i.status !== 'not tested')
      ? 'looks-good'
      : 'incomplete';
  return { items, overall, caution: SCREENING_CAUTION };
}
