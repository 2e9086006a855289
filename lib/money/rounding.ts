/**
 * The one rounding rule for money in Tallyvat.
 *
 * RULE: whenever an amount of money is computed from a non-integer product or quotient
 * (price × gallons, kWh × tariff, total ÷ gallons, cost × percentage), the result is
 * rounded to the whole cent, HALF AWAY FROM ZERO (0.5 → 1, −0.5 → −1, 2.5 → 3).
 *
 * Before rounding, the raw value is reduced to 15 significant digits so that binary
 * floating-point noise does not decide a half-cent (1.005 × 100 evaluates to
 * 100.49999999999999 in IEEE-754 doubles, but is meant as 100.5 and rounds to 101).
 * IEEE-754 doubles carry 15–17 significant decimal digits, so 15 digits are always exact
 * for the decimal inputs the app uses (cents, litres with 3 decimals, percentages).
 *
 * Every module that turns a fractional value into cents calls {@link roundHalfUp} or
 * {@link multiplyCents}; none rounds on its own.
 */

/** Significant digits kept before deciding a half (IEEE-754 double precision guarantees 15). */
const SIGNIFICANT_DIGITS = 15; // IEEE 754-2008 binary64: 15 decimal digits always round-trip

/**
 * Rounds a value to the nearest integer, halves away from zero (the money rounding rule).
 * @param value any finite number (usually a fractional amount of cents)
 * @returns the integer nearest to `value`; exact halves go away from zero
 * @throws RangeError if `value` is not finite
 */
export function roundHalfUp(value: number): number {
  if (!Number.isFinite(value)) throw new RangeError(`Cannot round a non-finite value (${value})`);
  if (value === 0) return 0;
  const magnitude = Number(Math.abs(value).toPrecision(SIGNIFICANT_DIGITS));
  const rounded = Math.floor(magnitude + 0.5);
  return value < 0 && rounded !== 0 ? -rounded : rounded;
}

/**
 * Throws unless `cents` is a safe integer number of cents.
 * @param cents the amount to check
 * @param what a name for the amount, used in the error message
 */
export function assertCents(cents: number, what = 'amount'): void {
  if (!Number.isSafeInteger(cents)) {
    throw new RangeError(`${what} must be a whole number of cents (safe integer), got ${cents}`);
  }
}

/**
 * Multiplies a rate in cents (a price per gallon, a tariff per kWh …) by a quantity and
 * rounds the product to the whole cent with the money rounding rule (half away from zero).
 * The rate may carry a fraction of a cent (statutory rates such as 24.4 ¢/gal); the result
 * is always integer cents.
 * @param rateCents cents per unit (finite; usually an integer)
 * @param quantity a finite multiplier (e.g. gallons drawn)
 * @returns integer cents
 * @example multiplyCents(389, 12.5) // 4862.5 → 4863
 */
export function multiplyCents(rateCents: number, quantity: number): number {
  if (!Number.isFinite(rateCents)) throw new RangeError(`rateCents must be finite, got ${rateCents}`);
  if (!Number.isFinite(quantity)) throw new RangeError(`quantity must be finite, got ${quantity}`);
  const result = roundHalfUp(rateCents * quantity);
  assertCents(result, 'product');
  return result;
}

/**
 * Adds amounts in cents exactly.
 * @param amountsCents integer amounts of cents
 * @returns their sum, in cents (0 for an empty list)
 * @throws RangeError if any amount, or the sum, is not a safe integer
 */
export function sumCents(amountsCents: readonly number[]): number {
  let total = 0;
  amountsCents.forEach((cents, index) => {
    assertCents(cents, `amount #${index + 1}`);
    total += cents;
  });
  assertCents(total, 'sum');
  return total;
}

/**
 * Splits an amount of cents in proportion to weights, by the largest-remainder method, so
 * that the parts are whole cents and add up exactly to the total. Ties in the remainder go
 * to the earlier weight.
 * @param totalCents the integer amount to split (may be negative)
 * @param weights non-negative finite weights, at least one of them positive
 * @returns one integer amount per weight, summing to `totalCents`
 * @example allocate(100, [1, 1, 1]) // [34, 33, 33]
 */
export function allocate(totalCents: number, weights: readonly number[]): number[] {
  assertCents(totalCents, 'totalCents');
  if (weights.length === 0) throw new RangeError('allocate needs at least one weight');
  let weightSum = 0;
  for (const w of weights) {
    if (!Number.isFinite(w) || w < 0) throw new RangeError(`weights must be finite and ≥ 0, got ${w}`);
    weightSum += w;
  }
  if (weightSum <= 0) throw new RangeError('at least one weight must be positive');

  const sign = totalCents < 0 ? -1 : 1;
  const magnitude = Math.abs(totalCents);
  const shares = weights.map((w, index) => {
    const exact = (magnitude * w) / weightSum;
    const floor = Math.floor(exact);
    return { index, floor, remainder: exact - floor, positive: w > 0 };
  });
  let leftover = magnitude - shares.reduce((acc, s) => acc + s.floor, 0);
  // Largest remainder first; ties to the earlier index. Zero weights never receive a cent.
  const order = shares.filter((s) => s.positive).sort((a, b) => b.remainder - a.remainder || a.index - b.index);
  let cursor = 0;
  while (leftover > 0 && order.length > 0) {
    const share = order[cursor % order.length];
    if (share) share.floor += 1;
    leftover -= 1;
    cursor += 1;
  }
  // Floating-point excess (never expected): take it back from the smallest remainders.
  cursor = order.length - 1;
  while (leftover < 0 && order.length > 0) {
    const share = order[((cursor % order.length) + order.length) % order.length];
    if (share && share.floor > 0) {
      share.floor -= 1;
      leftover += 1;
    }
    cursor -= 1;
  }
  return shares.map((s) => (s.floor === 0 ? 0 : sign * s.floor));
}
