import { assertCents, roundHalfUp, sumCents } from '../money';

/** Inputs to {@link batchCost}; every amount is integer cents. */
export interface BatchCostInput {
  chemicalsCents: number;
  energyCents: number;
  feedstockCents: number;
  otherCents: number;
  /** Gallons of finished fuel released to the tank (0 for a rejected batch). */
  gallonsReleased: number;
}

/** Result of {@link batchCost}. */
export interface BatchCost {
  totalCents: number;
  /** Total ÷ gallons released, rounded half up to the cent; null when nothing was released. */
  costPerGallonCents: number | null;
  breakdown: {
    chemicalsCents: number;
    energyCents: number;
    feedstockCents: number;
    otherCents: number;
  };
}

/**
 * Cost of a batch and its cost per gallon.
 * @param input cost components in cents and the gallons released (convert litres with lib/units)
 * @returns total, cost per gallon (null if 0 gallons) and the breakdown
 */
export function batchCost(input: BatchCostInput): BatchCost {
  const { chemicalsCents, energyCents, feedstockCents, otherCents, gallonsReleased } = input;
  assertCents(chemicalsCents, 'chemicalsCents');
  assertCents(energyCents, 'energyCents');
  assertCents(feedstockCents, 'feedstockCents');
  assertCents(otherCents, 'otherCents');
  if (!Number.isFinite(gallonsReleased) || gallonsReleased < 0) {
    throw new RangeError(`Gallons released must be ≥ 0, got ${gallonsReleased}`);
  }
  const totalCents = sumCents([chemicalsCents, energyCents, feedstockCents, otherCents]);
  return {
    totalCents,
    costPerGallonCents: gallonsReleased > 0 ? roundHalfUp(totalCents / gallonsReleased) : null,
    breakdown: { chemicalsCents, energyCents, feedstockCents, otherCents },
  };
}
