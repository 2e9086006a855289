import { formatRateCents, roundHalfUp } from '@/lib/money';
import {
  drawCharge,
  memberPriceCentsPerGallon,
  type DeclaredUse,
  type DrawCharge,
  type PriceBreakdown,
  type PricingPolicy,
} from '@/lib/pricing';
import { LITERS_PER_US_GALLON, volumeLabel, type UnitSystem } from '@/lib/units';
import { mlToUnits } from '@/lib/tank/volume';

/**
 * Pricing policies between the database and the co-op's units (pure; safe in client code).
 *
 * The database stores every rate in cents per US gallon, NUMERIC(12,3). A co-op that works in
 * litres sets and sees its prices per litre: a rate per litre with at most three decimals of a
 * cent survives the trip (× 3.785411784, rounded to 3 decimals, and back, rounded again) exactly,
 * because the stored rounding error (≤ 0.0005 ¢/gal) is below 0.0005 ¢/L.
 *
 * The pricing math in lib/pricing is per unit of volume: we feed it cents per co-op unit and a
 * quantity in co-op units, so a metric co-op's "€1.50 a litre × 40 L" is exactly 6000 cents.
 */

/** A pricing policy row as stored: cents per US gallon as NUMERIC strings (or numbers). */
export interface PolicyRow {
  kind: PricingPolicy['kind'];
  price_cents_per_gallon: string | number | null;
  margin_cents_per_gallon: string | number | null;
  margin_pct: string | number | null;
  surcharge_cents_per_gallon: string | number;
  road_tax_cents_per_gallon: string | number;
}

const round3 = (v: number) => roundHalfUp(v * 1000) / 1000;

/**
 * A rate in cents per co-op unit → cents per US gallon as the NUMERIC(12,3) text stored.
 * @param centsPerUnit cents per gallon ('us') or per litre ('metric'), at most 3 decimals
 */
export function perUnitToPerGallonText(centsPerUnit: number, units: UnitSystem): string {
  const perGallon = units === 'us' ? centsPerUnit : centsPerUnit * LITERS_PER_US_GALLON;
  return (roundHalfUp(perGallon * 1000) / 1000).toFixed(3);
}

/**
 * A stored rate in cents per US gallon → cents per co-op unit, rounded to 3 decimals.
 * @param centsPerGallon the stored rate
 */
export function perGallonToPerUnit(centsPerGallon: string | number, units: UnitSystem): number {
  const v = Number(centsPerGallon);
  return units === 'us' ? v : round3(v / LITERS_PER_US_GALLON);
}

/**
 * The stored policy as the lib/pricing policy in the co-op's units. Whole-cent fields (a fixed
 * price, a margin amount) come back as whole cents per unit.
 */
export function policyInUnits(row: PolicyRow, units: UnitSystem): PricingPolicy {
  const extras = {
    surchargeCentsPerGallon: perGallonToPerUnit(row.surcharge_cents_per_gallon, units),
    roadTaxCentsPerGallon: perGallonToPerUnit(row.road_tax_cents_per_gallon, units),
  };
  switch (row.kind) {
    case 'fixed':
      return {
        kind: 'fixed',
        priceCents: roundHalfUp(perGallonToPerUnit(row.price_cents_per_gallon ?? 0, units)),
        ...extras,
      };
    case 'cost-plus-amount':
      return {
        kind: 'cost-plus-amount',
        marginCents: roundHalfUp(perGallonToPerUnit(row.margin_cents_per_gallon ?? 0, units)),
        ...extras,
      };
    case 'cost-plus-percent':
      return { kind: 'cost-plus-percent', marginPct: Number(row.margin_pct ?? 0), ...extras };
  }
}

export interface DrawPricing {
  /** Per co-op unit (gallon or litre), cents. */
  perUnit: PriceBreakdown;
  /** The draw's lines in whole cents (lib/money rounding, per line). */
  charge: DrawCharge;
  /** The rates locked on the draw row, cents per US gallon (NUMERIC(12,3) text). */
  locked: { unitPriceCentsPerGallon: string; surchargeCentsPerGallon: string; roadTaxCentsPerGallon: string };
  /** The tank's average cost per co-op unit at the time, cents (unrounded), or null when empty. */
  avgCostCentsPerUnit: number | null;
}

/**
 * Prices a draw with the policy in force and the tank's moving-average cost just before it.
 * @param row the policy in force (stored form)
 * @param units the co-op's unit system
 * @param tank the tank's on-hand millilitres and stock value in cents before the draw
 * @param quantityMilliUnits the quantity drawn in thousandths of the co-op's unit (as metered)
 * @param declaredUse road use adds the road-fuel tax
 */
export function priceDraw(
  row: PolicyRow,
  units: UnitSystem,
  tank: { onHandMl: number; valueCents: number },
  quantityMilliUnits: number,
  declaredUse: DeclaredUse,
): DrawPricing {
  const onHandUnits = mlToUnits(tank.onHandMl, units);
  const avgCostCentsPerUnit = onHandUnits > 0 ? tank.valueCents / onHandUnits : null;
  const perUnit = memberPriceCentsPerGallon(policyInUnits(row, units), avgCostCentsPerUnit, declaredUse);
  const charge = drawCharge(quantityMilliUnits / 1000, perUnit);
  return {
    perUnit,
    charge,
    avgCostCentsPerUnit,
    locked: {
      unitPriceCentsPerGallon: perUnitToPerGallonText(perUnit.baseCents, units),
      surchargeCentsPerGallon: perUnitToPerGallonText(perUnit.surchargeCents, units),
      roadTaxCentsPerGallon: perUnitToPerGallonText(perUnit.taxCents, units),
    },
  };
}

/** Cents (may carry a fraction) as "24.4¢" for rates under a dollar, else "$4.25". */
export function formatRate(cents: number, currency = 'USD'): string {
  if (Math.abs(cents) < 100) return `${Number(cents.toFixed(3))}¢`;
  return formatRateCents(cents, currency);
}

/**
 * One line describing a policy in the co-op's units, e.g.
 * "Cost + $0.40/gal · reserve surcharge 10¢/gal · road tax 24.4¢/gal (road use only)".
 */
export function describePolicy(p: PricingPolicy, units: UnitSystem, currency = 'USD'): string {
  const per = `/${volumeLabel(units)}`;
  const base =
    p.kind === 'fixed'
      ? `Fixed ${formatRateCents(p.priceCents, currency)}${per}`
      : p.kind === 'cost-plus-amount'
        ? `Average cost + ${formatRateCents(p.marginCents, currency)}${per}`
        : `Average cost + ${Number(p.marginPct.toFixed(2))}%`;
  const parts = [base];
  if (p.surchargeCentsPerGallon)
    parts.push(`reserve surcharge ${formatRate(p.surchargeCentsPerGallon, currency)}${per}`);
  if (p.roadTaxCentsPerGallon)
    parts.push(`road tax ${formatRate(p.roadTaxCentsPerGallon, currency)}${per} (road use only)`);
  return parts.join(' · ');
}
