import { assertCents, multiplyCents, roundHalfUp } from '../money';

/** How the co-op sets the member price per gallon. */
export type PricingPolicy = (
  | { kind: 'fixed'; priceCents: number }
  | { kind: 'cost-plus-amount'; marginCents: number }
  | { kind: 'cost-plus-percent'; marginPct: number }
) & {
  /** Added to every gallon whatever its use (e.g. a reserve fund), cents per gallon (≥ 0; may carry a fraction of a cent). */
  surchargeCentsPerGallon?: number;
  /**
   * Road-fuel tax, cents per gallon (≥ 0; may carry a fraction of a cent, e.g. the US federal
   * 24.4 ¢/gal, IRS Publication 510). Charged only when the declared use is 'road'.
   */
  roadTaxCentsPerGallon?: number;
};

export type PricingPolicyKind = PricingPolicy['kind'];

/** What the member declares the fuel is for; road-fuel tax applies to 'road' only. */
import type { DeclaredUse } from '@/models/vocabulary';
export type { DeclaredUse };

/** All declared uses, e.g. for a select. */
export { DECLARED_USES } from '@/models/vocabulary';

/**
 * Per-gallon price breakdown, cents per gallon. `baseCents` is always whole cents; the
 * surcharge and tax are the policy's rates and may carry a fraction of a cent, so `totalCents`
 * may too (display it with formatRateCents). Amounts charged are rounded in {@link drawCharge}.
 */
export interface PriceBreakdown {
  baseCents: number;
  surchargeCents: number;
  taxCents: number;
  /** base + surcharge + tax. */
  totalCents: number;
}

function requireCost(tankAvgCostCentsPerGallon: number | null): number {
  if (
    tankAvgCostCentsPerGallon === null ||
    !Number.isFinite(tankAvgCostCentsPerGallon) ||
    tankAvgCostCentsPerGallon < 0
  ) {
    throw new RangeError('A cost-based price needs the tank’s average cost per gallon (≥ 0 cents)');
  }
  return tankAvgCostCentsPerGallon;
}

function optionalRate(value: number | undefined, name: string): number {
  if (value === undefined) return 0;
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be ≥ 0 cents per gallon, got ${value}`);
  return value;
}

/**
 * Member price per gallon from the co-op's policy.
 * - fixed: base = priceCents;
 * - cost-plus-amount: base = average cost (rounded to the cent) + marginCents;
 * - cost-plus-percent: base = average cost × (1 + marginPct/100), rounded to the cent.
 * Rounding follows lib/money (half away from zero).
 * @param policy the co-op's pricing policy with optional surcharge and road tax per gallon
 * @param tankAvgCostCentsPerGallon the tank's moving-average cost, cents per gallon (may be null for 'fixed')
 * @param declaredUse 'road' adds the road tax; 'off-road' and 'heating' do not
 * @returns base, surcharge, tax and total cents per gallon
 */
export function memberPriceCentsPerGallon(
  policy: PricingPolicy,
  tankAvgCostCentsPerGallon: number | null,
  declaredUse: DeclaredUse,
): PriceBreakdown {
  let baseCents: number;
  switch (policy.kind) {
    case 'fixed':
      assertCents(policy.priceCents, 'priceCents');
      baseCents = policy.priceCents;
      break;
    case 'cost-plus-amount':
      assertCents(policy.marginCents, 'marginCents');
      baseCents = roundHalfUp(requireCost(tankAvgCostCentsPerGallon)) + policy.marginCents;
      break;
    case 'cost-plus-percent':
      if (!Number.isFinite(policy.marginPct)) throw new RangeError('marginPct must be a number');
      baseCents = roundHalfUp((requireCost(tankAvgCostCentsPerGallon) * (100 + policy.marginPct)) / 100);
      break;
  }
  if (baseCents < 0) throw new RangeError('The price per gallon cannot be negative');
  const surchargeCents = optionalRate(policy.surchargeCentsPerGallon, 'surchargeCentsPerGallon');
  const taxCents = declaredUse === 'road' ? optionalRate(policy.roadTaxCentsPerGallon, 'roadTaxCentsPerGallon') : 0;
  return {
    baseCents,
    surchargeCents,
    taxCents,
    totalCents: Number((baseCents + surchargeCents + taxCents).toPrecision(15)),
  };
}

/** Charge for one draw, integer cents; each component is one invoice line. */
export interface DrawCharge {
  fuelCents: number;
  surchargeCents: number;
  taxCents: number;
  /** Sum of the three lines (so an invoice total equals the sum of its lines). */
  totalCents: number;
}

/**
 * Charge for a draw, line by line: each per-gallon component × gallons, rounded to the cent
 * with {@link multiplyCents} (lib/money rule); the total is the sum of the rounded lines.
 * @param gallons gallons drawn (pump meter; convert litres with lib/units)
 * @param breakdown the per-gallon price from {@link memberPriceCentsPerGallon}
 * @returns the fuel, surcharge and tax lines and their total
 */
export function drawCharge(gallons: number, breakdown: PriceBreakdown): DrawCharge {
  if (!Number.isFinite(gallons) || gallons < 0) throw new RangeError(`Gallons must be ≥ 0, got ${gallons}`);
  const fuelCents = multiplyCents(breakdown.baseCents, gallons);
  const surchargeCents = multiplyCents(breakdown.surchargeCents, gallons);
  const taxCents = multiplyCents(breakdown.taxCents, gallons);
  return { fuelCents, surchargeCents, taxCents, totalCents: fuelCents + surchargeCents + taxCents };
}

/**
 * Total charge for a draw in cents (the sum of the lines of {@link drawCharge}).
 * @param gallons gallons drawn
 * @param breakdown the per-gallon price from {@link memberPriceCentsPerGallon}
 * @returns integer cents
 */
export function drawChargeCents(gallons: number, breakdown: PriceBreakdown): number {
  return drawCharge(gallons, breakdown).totalCents;
}
