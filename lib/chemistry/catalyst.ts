import { formatVolume, gallonsToLiters, type UnitSystem } from '../units';
import { KOH_PER_NAOH, type Catalyst } from './constants';

/**
 * What the titration solution (1 g/L) was made from:
 * - 'same-catalyst': the batch's own catalyst stock (same chemical, same purity as weighed);
 * - 'pure-reagent': reagent-grade (≈ 100 %) catalyst.
 */
export type TitrantSource = 'same-catalyst' | 'pure-reagent';

/** Which purity rule was applied (the app must show it). */
export type CatalystRule = 'base-over-purity-plus-titration' | 'all-over-purity' | 'converted-all-over-purity';

/** Inputs to {@link catalystGrams}. */
export interface CatalystInput {
  catalyst: Catalyst;
  /** Oil in the batch, litres. */
  oilLiters: number;
  /** Base amount of pure catalyst for fresh oil, g per L of oil (the co-op's recipe). */
  baseGramsPerLiter: number;
  /**
   * Average titration, mL of 1 g/L titrant per mL of oil, as titrated with `titrant`
   * (equals g of the titrant's chemical per L of oil). Not converted beforehand.
   */
  titrationMl: number;
  /** Chemical the titrant was made of; defaults to the batch's catalyst. */
  titrant?: Catalyst;
  /** Purity of the catalyst on hand (as weighed), % (0 < purity ≤ 100). */
  purityPct: number;
  /** 'same-catalyst' when the titrant was made from the batch's own catalyst stock; 'pure-reagent' when from reagent-grade catalyst. */
  titrantFrom: TitrantSource;
  /** Units for the explanation (the figures are always litres and grams); default 'metric'. */
  system?: UnitSystem;
}

/** Result of {@link catalystGrams}. */
export interface CatalystResult {
  /** Grams of the catalyst as weighed (at its purity) per litre of oil. */
  gramsPerLiter: number;
  /** Grams to weigh out for the whole batch. */
  totalGrams: number;
  rule: CatalystRule;
  /** The titration in g of pure batch catalyst per L of oil (converted by molar mass, purity not applied). */
  titrationPureGramsPerLiter: number;
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
 * Grams of `to` chemically equivalent to one gram of `from` (1, 1.4027 or 1/1.4027;
 * molar masses KOH 56.106, NaOH 39.997 g/mol, IUPAC standard atomic weights).
 */
function molarFactor(from: Catalyst, to: Catalyst): number {
  if (from === to) return 1;
  return from === 'NaOH' ? KOH_PER_NAOH : 1 / KOH_PER_NAOH;
}

/**
 * Computes the catalyst to weigh out for a batch. Purity is applied exactly once:
 *
 *   g/L weighed = (base + T × f × p_t) ÷ p
 *
 * with T the titration (mL of 1 g/L titrant per mL of oil = g of the titrant's chemical per L),
 * f the molar-mass factor from the titrant's chemical to the batch's (IUPAC), p the purity of
 * the catalyst as weighed and p_t the purity of the titrant's catalyst. Three cases follow:
 * - titrant made from the batch's own stock (same chemical, p_t = p): g/L = base ÷ p + T —
 *   the titration already reflects the stock's purity (common practice purity rule);
 * - titrant of the same chemical from pure reagent (p_t = 1): g/L = (base + T) ÷ p;
 * - titrant of the other chemical (necessarily not the batch's stock; pure reagent, p_t = 1):
 *   g/L = (base + T × f) ÷ p — converted by molar mass, then divided by the purity.
 *
 * @param input catalyst, oil litres, base g/L, titration mL with its titrant, purity % and titrant source
 * @returns g/L, total g, the rule applied and an explanation that states it
 * @throws RangeError for negative amounts, a purity outside (0, 100], or a titrant of the
 *   other chemical said to be made from the batch's own stock
 * @example catalystGrams({ catalyst: 'KOH', oilLiters: 113, baseGramsPerLiter: 7, titrationMl: 5.0667,
 *   purityPct: 90, titrantFrom: 'same-catalyst' }) // ≈ 12.844 g/L, 1451.4 g
 */
export function catalystGrams(input: CatalystInput): CatalystResult {
  const { catalyst, oilLiters, baseGramsPerLiter, titrationMl, purityPct, titrantFrom } = input;
  const titrant = input.titrant ?? catalyst;
  const system = input.system ?? 'metric';
  assertNonNegative(oilLiters, 'Oil volume (L)');
  assertNonNegative(baseGramsPerLiter, 'Base amount (g/L)');
  assertNonNegative(titrationMl, 'Titration (mL)');
  assertPurityPct(purityPct);
  if (titrant !== catalyst && titrantFrom === 'same-catalyst') {
    throw new RangeError(
      `A ${titrant} titrant cannot have been made from this batch's ${catalyst} stock: choose "pure reagent" for the titrant, or titrate with a ${catalyst} solution made from the batch's stock`,
    );
  }

  const purity = purityPct / 100;
  const factor = molarFactor(titrant, catalyst);
  const titrationPureGramsPerLiter = titrationMl * factor;
  const rule: CatalystRule =
    titrant !== catalyst
      ? 'converted-all-over-purity'
      : titrantFrom === 'same-catalyst'
        ? 'base-over-purity-plus-titration'
        : 'all-over-purity';
  const gramsPerLiter =
    rule === 'base-over-purity-plus-titration'
      ? baseGramsPerLiter / purity + titrationMl
      : (baseGramsPerLiter + titrationPureGramsPerLiter) / purity;
  const totalGrams = gramsPerLiter * oilLiters;

  const wholePct = Number.isInteger(purityPct);
  const purityText = `${fmt(purity, wholePct ? 2 : 4)
    .replace(/0+$/, '')
    .replace(/\.$/, '.0')} (${wholePct ? purityPct : Number(purityPct.toFixed(2))} % purity)`;
  const titration = `${fmt(titrationMl, 2)} mL ${titrant} titration`;
  const arithmetic =
    rule === 'base-over-purity-plus-titration'
      ? `${fmt(baseGramsPerLiter, 2)} g/L ÷ ${purityText} + ${fmt(titrationMl, 2)} g/L titration`
      : rule === 'all-over-purity'
        ? `(${fmt(baseGramsPerLiter, 2)} g/L + ${fmt(titrationMl, 2)} g/L titration) ÷ ${purityText}`
        : `(${fmt(baseGramsPerLiter, 2)} g/L + ${titration} × ${fmt(factor, 4)} = ${fmt(titrationPureGramsPerLiter, 2)} g/L ${catalyst}) ÷ ${purityText}`;
  const why =
    rule === 'base-over-purity-plus-titration'
      ? `Rule: base ÷ purity + titration, because the titrant was made from the batch's own ${catalyst} (the titration already reflects its purity).`
      : rule === 'all-over-purity'
        ? `Rule: (base + titration) ÷ purity, because the titrant was made from pure reagent ${catalyst}.`
        : `Rule: (base + titration converted by molar mass) ÷ purity, because the titrant was pure reagent ${titrant}: ${fmt(factor, 4)} g ${catalyst} per g ${titrant} (${catalyst === 'KOH' ? '56.106 / 39.997' : '39.997 / 56.106'}, IUPAC molar masses).`;
  const volume =
    system === 'us'
      ? `${formatVolume(oilLiters, 'us', 2)} (${formatVolume(oilLiters, 'metric', 1)})`
      : formatVolume(oilLiters, 'metric', 1);
  const perGallon = system === 'us' ? ` (${fmt(gramsPerLiter * gallonsToLiters(1), 1)} g/gal)` : '';
  const explanation = `${arithmetic} = ${fmt(gramsPerLiter, 2)} g/L${perGallon} × ${volume} = ${fmt(totalGrams, 1)} g ${catalyst}. ${why}`;

  return { gramsPerLiter, totalGrams, rule, titrationPureGramsPerLiter, explanation };
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
  return grams * molarFactor(from, to);
}
