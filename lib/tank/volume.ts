import { LITERS_PER_US_GALLON, volumeLabel, type UnitSystem } from '@/lib/units';
import { numberFormat } from '@/lib/intl';

/**
 * Volumes in the co-op's units ↔ stored millilitres (pure; safe in client components).
 * Forms and JSON carry volumes in the co-op's unit (US gallons or litres) with at most three
 * decimals; we hold them as whole thousandths of that unit ("milli-units") so no float decides
 * anything, and store whole millilitres (litres NUMERIC(14,3)).
 */

/** Millilitres in one thousandth of the co-op's unit. */
const ML_PER_MILLI_UNIT: Record<UnitSystem, number> = { us: LITERS_PER_US_GALLON, metric: 1 };

/**
 * Converts a volume in thousandths of the co-op's unit to whole millilitres.
 * US gallons are rounded to the nearest millilitre (half up); litres are exact.
 * @param milliUnits thousandths of a US gallon ('us') or of a litre ('metric')
 * @param units the co-op's unit system
 * @returns whole millilitres
 */
export function milliUnitsToMl(milliUnits: number, units: UnitSystem): number {
  if (units === 'metric') return milliUnits;
  const sign = milliUnits < 0 ? -1 : 1;
  return sign * Math.floor(Math.abs(milliUnits) * ML_PER_MILLI_UNIT.us + 0.5);
}

/**
 * Stored millilitres in the co-op's unit (unrounded).
 * @param ml whole millilitres
 * @param units the co-op's unit system
 * @returns US gallons or litres
 */
export function mlToUnits(ml: number, units: UnitSystem): number {
  return units === 'us' ? ml / 1000 / LITERS_PER_US_GALLON : ml / 1000;
}

/**
 * The largest rounding crumb, in mL, between a volume typed in the co-op's unit and the sum of
 * stored millilitres. Each US-gallon amount is rounded to the nearest mL when stored, so after
 * "100 gal in, 12.5 gal reserved" the book may hold 87.49986 gal where members expect 87.5. A
 * request that exceeds what is left by no more than this (less than one input step, 0.001 gal =
 * 3.785 mL) is trimmed to exactly what is left instead of being refused. Litres are exact: 0.
 */
export function roundingCrumbMl(units: UnitSystem): number {
  return units === 'us' ? 3 : 0;
}

/**
 * What a request for `requestedMl` gets out of `availableMl`: all of it; or, when it exceeds what
 * is left by no more than the {@link roundingCrumbMl}, exactly what is left (the meter is the truth;
 * a book short by a crumb gives up its last millilitres); null when it cannot be covered.
 */
export function coveredMl(requestedMl: number, availableMl: number, units: UnitSystem): number | null {
  if (requestedMl <= availableMl) return requestedMl;
  return availableMl > 0 && requestedMl - availableMl <= roundingCrumbMl(units) ? availableMl : null;
}

/**
 * "Available" in the co-op's unit with `digits` decimals: the largest such figure that a member
 * could ask for and get (its millilitres, rounded as {@link milliUnitsToMl} rounds a request,
 * fit in `ml` up to the {@link roundingCrumbMl}). So a member who asks for exactly the figure
 * shown is never refused, and 75.708 L (entered as 20 gal) shows as 20 gal.
 * @param ml whole millilitres available
 * @param units the co-op's unit system
 * @param digits decimals kept (0–3, default 3)
 * @returns gallons or litres
 */
export function mlToUnitsFloor(ml: number, units: UnitSystem, digits = 3): number {
  if (ml <= 0) return 0;
  const f = 10 ** digits;
  const limit = ml + roundingCrumbMl(units);
  let steps = Math.round(mlToUnits(ml, units) * f) + 1; // the crumb allows at most one step above the nearest
  while (steps > 0 && milliUnitsToMl(Math.round((steps * 1000) / f), units) > limit) steps -= 1;
  return steps / f;
}

/** Rounds a volume in the co-op's unit to 3 decimals for JSON. */
export function mlToUnits3(ml: number, units: UnitSystem): number {
  return Math.round(mlToUnits(ml, units) * 1000) / 1000;
}

/**
 * Formats millilitres in the co-op's unit, e.g. "12.5 gal" / "47.3 L".
 * @param ml whole millilitres
 * @param units the co-op's unit system
 * @param opts digits (default 1) and floor (round down instead of to nearest)
 */
export function formatMl(
  ml: number,
  units: UnitSystem,
  opts: { digits?: number; floor?: boolean; signed?: boolean } = {},
): string {
  const digits = opts.digits ?? 1;
  let v = opts.floor ? mlToUnitsFloor(ml, units, digits) : mlToUnits(ml, units);
  if (Number(v.toFixed(digits)) === 0) v = 0;
  const text = numberFormat('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits }).format(v);
  return `${opts.signed && v > 0 ? '+' : ''}${text} ${volumeLabel(units)}`;
}

/** The unit word for labels: "gallons" or "litres". */
export function unitWord(units: UnitSystem): string {
  return units === 'us' ? 'gallons' : 'litres';
}

/**
 * A tank's fuel free to reserve, draw or move, in whole millilitres: on hand − reserved − held
 * (fuel of a batch under review), never below zero. `reservedMl` is net of lapsed reservations
 * where the caller reads them (lib/tank findTankRows, the overview).
 */
export function tankAvailableMl(onHandMl: number, reservedMl: number, heldMl: number): number {
  return Math.max(0, onHandMl - reservedMl - heldMl);
}
