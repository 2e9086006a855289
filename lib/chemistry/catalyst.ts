import { KOH_PER_NAOH, type Catalyst } from './constants';

/** Where the titration solution's catalyst came from. */
export type TitrantSource = 'same-catalyst' | 'pure-reagent';

/** Which purity rule was applied (the app must show it). */
export type CatalystRule = 'base-over-purity-plus-titration' | 'all-over-purity';

/** Inputs to {@link catalystGrams}. */
export interface CatalystInput {
  catalyst: Catalyst;
  /** Oil in the batch, litres. */
  oilLiters: number;
  /** Base amount of pure catalyst for fresh oil, g per L of oil (the co-op's recipe). */
  baseGramsPerLiter: number;
  /** Average titration, mL of 1 g/L titrant per mL of oil, which equals extra g of catalyst per L of oil. */
  titrationMl: number;
  /** Purity of the catalyst on hand, % (0 < purity ≤ 100). */
  purityPct: number;
  /** 'same-catalyst' when the titrant was made from this catalyst; 'pure-reagent' when made from reagent-grade catalyst. */
  titrantFrom: TitrantSource;
}

/** Result of {@link catalystGrams}. */
export interface CatalystResult {
  /** Grams of the catalyst as weighed (at its purity) per litre of oil. */
  gramsPerLiter: number;
  /** Grams to weigh out for the whole batch. */
  totalGrams: number;
  rule: CatalystRule;
  /** One-line account of the arithmetic and why this rule applies. */
  explanation: string;
}

function assertNonNegative(value: number, name: string): void {
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be a number ≥ 0, got ${value}`);
}

/**
 * Throws unless a purity percentage is in (0, 100].
 * @param purityPct catalyst purity, %
 */
export function assertPurityPct(purityPct: number): void {
  if (!Number.isFinite(purityPct) || purityPct <= 0 || purityPct > 100) {
    throw new RangeError(`Purity must be more than 0 % and at most 100 %, got ${purityPct}`);
  }
}

function fmt(value: number, digits: number): string {
  return value.toFixed(digits);
}

/**
 * Computes the catalyst to weigh out for a batch (purity rule, common practice):
 * - titrant made from the same catalyst: g/L = base ÷ purity + titration (the titration
 *   already reflects the purity of the catalyst on hand);
 * - titrant made from pure reagent: g/L = (base + titration) ÷ purity.
 *
 * @param input catalyst, oil litres, base g/L, titration mL, purity % and titrant source
 * @returns g/L, total g, the rule applied and an explanation
 * @throws RangeError for negative amounts or a purity outside (0, 100]
 * @example catalystGrams({ catalyst: 'KOH', oilLiters: 113, baseGramsPerLiter: 7, titrationMl: 5.0667,
 *   purityPct: 90, titrantFrom: 'same-catalyst' }) // ≈ 12.844 g/L, 1451.4 g
 */
export function catalystGrams(input: CatalystInput): CatalystResult {
  const { catalyst, oilLiters, baseGramsPerLiter, titrationMl, purityPct, titrantFrom } = input;
  assertNonNegative(oilLiters, 'Oil volume (L)');
  assertNonNegative(baseGramsPerLiter, 'Base amount (g/L)');
  assertNonNegative(titrationMl, 'Titration (mL)');
  assertPurityPct(purityPct);

  const purity = purityPct / 100;
  const rule: CatalystRule = titrantFrom === 'same-catalyst' ? 'base-over-purity-plus-titration' : 'all-over-purity';
  const gramsPerLiter =
    rule === 'base-over-purity-plus-titration'
      ? baseGramsPerLiter / purity + titrationMl
      : (baseGramsPerLiter + titrationMl) / purity;
  const totalGrams = gramsPerLiter * oilLiters;

  const wholePct = Number.isInteger(purityPct);
  const purityText = `${fmt(purity, wholePct ? 2 : 4).replace(/0+$/, '').replace(/\.$/, '.0')} (${wholePct ? purityPct : Number(purityPct.toFixed(2))} % purity)`;
  const arithmetic =
    rule === 'base-over-purity-plus-titration'
      ? `${fmt(baseGramsPerLiter, 2)} g/L ÷ ${purityText} + ${fmt(titrationMl, 2)} g/L titration`
      : `(${fmt(baseGramsPerLiter, 2)} g/L + ${fmt(titrationMl, 2)} g/L titration) ÷ ${purityText}`;
  const why =
    rule === 'base-over-purity-plus-titration'
      ? `Rule: base ÷ purity + titration, because the titrant was made from the same ${catalyst} (the titration already reflects its purity).`
      : `Rule: (base + titration) ÷ purity, because the titrant was made from pure reagent.`;
  const explanation = `${arithmetic} = ${fmt(gramsPerLiter, 2)} g/L × ${fmt(oilLiters, 1)} L = ${fmt(totalGrams, 1)} g ${catalyst}. ${why}`;

  return { gramsPerLiter, totalGrams, rule, explanation };
}

/**
 * Converts a mass of one catalyst to the chemically equivalent mass of the other
 * (molar-mass ratio KOH/NaOH = 56.106 / 39.997 ≈ 1.4027, IUPAC).
 * @param grams mass of catalyst `from`, g (pure basis)
 * @param from the catalyst the mass is given in
 * @param to the catalyst wanted
 * @returns equivalent mass of `to`, g
 */
export function convertCatalystGrams(grams: number, from: Catalyst, to: Catalyst): number {
  if (from === to) return grams;
  return from === 'NaOH' ? grams * KOH_PER_NAOH : grams / KOH_PER_NAOH;
}
