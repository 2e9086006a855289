import { KOH_PER_NAOH, OIL_DENSITY_G_PER_ML, type Catalyst } from './constants';

/**
 * Acid number per % FFA (as oleic acid): AN = V·N·56.1/m and FFA % = V·N·28.2/m,
 * so FFA % = AN / (56.1 / 28.2) = AN / 1.989 (usually quoted as AN / 1.99).
 */
export const ACID_NUMBER_PER_FFA_PERCENT = 56.1 / 28.2; // AOCS Ca 5a-40 (28.2) with ASTM D974 (56.1)

/** FFA % above which a single-stage base process is not advised (acid esterification first). */
export const MAX_FFA_PERCENT_SINGLE_STAGE = 5; // common practice (university extension notes)

/** Used-oil quality bands by KOH-equivalent titration, mL per mL of oil. */
export type OilQualityBand = 'good' | 'average' | 'poor' | 'very-poor' | 'reject';

/**
 * Upper limits (inclusive) of the bands, mL of 1 g/L KOH titrant per mL oil.
 * 0–4 good; 5–7 average; 8–10 poor (acid pre-treatment advised); above ~18 reject.
 * Non-integer readings fall in the band whose upper limit they do not exceed.
 */
export const OIL_QUALITY_BAND_LIMITS_ML: ReadonlyArray<{ band: Exclude<OilQualityBand, 'reject'>; maxMl: number }> = [
  { band: 'good', maxMl: 4 }, // common practice
  { band: 'average', maxMl: 7 }, // common practice
  { band: 'poor', maxMl: 10 }, // common practice
  { band: 'very-poor', maxMl: 18 }, // common practice (above ~18 reject)
];

/** Inputs to {@link acidNumber}. */
export interface AcidNumberInput {
  /** Titration, mL of 1 g/L titrant per mL of oil (= mg catalyst per mL oil). */
  titrationMl: number;
  /** Catalyst the titrant was made from. */
  titrant: Catalyst;
  /** Oil density, g/mL; default 0.92. */
  oilDensityGPerMl?: number;
}

/**
 * Converts a titration made with either titrant to its KOH equivalent.
 * @param titrationMl titration, mL of 1 g/L titrant per mL oil
 * @param titrant catalyst the titrant was made from
 * @returns mL of 1 g/L KOH titrant per mL oil (NaOH × 1.4027, IUPAC molar masses)
 */
export function kohEquivalentTitrationMl(titrationMl: number, titrant: Catalyst): number {
  if (!Number.isFinite(titrationMl) || titrationMl < 0)
    throw new RangeError(`Titration must be ≥ 0 mL, got ${titrationMl}`);
  return titrant === 'NaOH' ? titrationMl * KOH_PER_NAOH : titrationMl;
}

/**
 * Acid number from a small-batch titration, mg KOH per g of oil (ASTM D974 definition):
 * with a 1 g/L titrant, 1 mL per mL of oil = 1 mg catalyst per mL oil, so AN = T / ρ
 * (× 1.4027 for a NaOH titrant).
 * @param input titration mL, titrant and optional oil density g/mL
 * @returns acid number, mg KOH/g (T = 4 mL KOH at 0.92 g/mL → 4.35)
 */
export function acidNumber(input: AcidNumberInput): number {
  const density = input.oilDensityGPerMl ?? OIL_DENSITY_G_PER_ML;
  if (!Number.isFinite(density) || density <= 0) throw new RangeError(`Oil density must be > 0 g/mL, got ${density}`);
  return kohEquivalentTitrationMl(input.titrationMl, input.titrant) / density;
}

/**
 * Free fatty acids as % oleic acid from the acid number (AOCS Ca 5a-40: FFA % = AN / 1.99).
 * @param acidNumberMgKohPerG acid number, mg KOH/g
 * @returns FFA, % by mass as oleic acid (AN 4.35 → 2.19 %)
 */
export function ffaPercentFromAcidNumber(acidNumberMgKohPerG: number): number {
  if (!Number.isFinite(acidNumberMgKohPerG) || acidNumberMgKohPerG < 0) {
    throw new RangeError(`Acid number must be ≥ 0, got ${acidNumberMgKohPerG}`);
  }
  return acidNumberMgKohPerG / ACID_NUMBER_PER_FFA_PERCENT;
}

/** Result of {@link oilQualityBand}. */
export interface OilQualityAssessment {
  band: OilQualityBand;
  /** mg KOH/g at the given density. */
  acidNumberMgKohPerG: number;
  /** % FFA as oleic acid. */
  ffaPercent: number;
  /** True when the band is poor or worse, or FFA > 5 % (common practice). */
  needsAcidPretreatment: boolean;
  /** True for the 'reject' band. */
  reject: boolean;
  message: string;
}

const BAND_MESSAGES: Record<OilQualityBand, string> = {
  good: 'Good oil for a single-stage base process.',
  average: 'Average oil; a single-stage base process usually works.',
  poor: 'Poor oil: too acidic for a reliable single-stage base process — acid pre-treatment (esterification) is advised.',
  'very-poor': 'Very poor oil: too acidic for a single-stage base process — acid pre-treatment (esterification) first.',
  reject: 'Outside the usual range for processing: consider rejecting this oil.',
};

/**
 * Classifies used oil by its KOH-equivalent titration (common practice bands):
 * ≤ 4 good, ≤ 7 average, ≤ 10 poor, ≤ 18 very poor, > 18 reject.
 * @param titrationMlKohEquivalent mL of 1 g/L KOH titrant per mL oil (use {@link kohEquivalentTitrationMl} for NaOH)
 * @param oilDensityGPerMl oil density for the AN/FFA figures, default 0.92
 * @returns band, AN, FFA and whether acid pre-treatment is advised
 */
export function oilQualityBand(
  titrationMlKohEquivalent: number,
  oilDensityGPerMl = OIL_DENSITY_G_PER_ML,
): OilQualityAssessment {
  const an = acidNumber({ titrationMl: titrationMlKohEquivalent, titrant: 'KOH', oilDensityGPerMl });
  const ffaPercent = ffaPercentFromAcidNumber(an);
  const band = OIL_QUALITY_BAND_LIMITS_ML.find((b) => titrationMlKohEquivalent <= b.maxMl)?.band ?? 'reject';
  const needsAcidPretreatment = (band !== 'good' && band !== 'average') || ffaPercent > MAX_FFA_PERCENT_SINGLE_STAGE;
  const message =
    needsAcidPretreatment && (band === 'good' || band === 'average')
      ? `FFA above ${MAX_FFA_PERCENT_SINGLE_STAGE} %: too acidic for a single-stage base process — acid pre-treatment is advised.`
      : BAND_MESSAGES[band];
  return { band, acidNumberMgKohPerG: an, ffaPercent, needsAcidPretreatment, reject: band === 'reject', message };
}
