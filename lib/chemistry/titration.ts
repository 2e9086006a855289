/** Absolute part of the outlier threshold, mL. */
export const OUTLIER_MIN_DIFFERENCE_ML = 0.5; // common practice
/** Relative part of the outlier threshold, fraction of the median of the other trials. */
export const OUTLIER_RELATIVE_DIFFERENCE = 0.15; // common practice

/** Tolerance for floating-point comparisons of millilitre readings. */
const ML_EPSILON = 1e-9;

/** Averaged titration trials. */
export interface TitrationAverage {
  /** Mean of all trials minus the blank, mL of titrant per mL of oil (= g catalyst per L oil with a 1 g/L titrant). */
  averageMl: number;
  /** The trials as given, mL. */
  trials: number[];
  /** Indexes (0-based) of trials that differ from the median of the others by more than the threshold. */
  outlierIndexes: number[];
  /** Largest minus smallest trial, mL. */
  spreadMl: number;
  /** Mean of the trials that are not outliers, minus the blank; null when no trial or every trial is flagged. */
  averageWithoutOutliersMl: number | null;
  /** The blank subtracted from the mean, mL. */
  blankMl: number;
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  const upper = sorted[mid] ?? 0;
  if (sorted.length % 2 === 1) return upper;
  const lower = sorted[mid - 1] ?? upper;
  return (lower + upper) / 2;
}

function mean(values: readonly number[]): number {
  return values.reduce((acc, v) => acc + v, 0) / values.length;
}

/**
 * Averages titration trials (mL of 1 g/L catalyst solution per mL of oil) and flags
 * suspicious trials.
 *
 * Outlier rule (common practice): a trial is flagged when it differs from the median of
 * the other trials by more than max(0.5 mL, 15 % of that median). With two trials that
 * disagree, both are flagged (nothing says which is right — titrate again). One trial is
 * allowed and is never flagged. Flagged trials are still included in `averageMl`; the
 * brewer decides whether to re-titrate (`averageWithoutOutliersMl` is given for comparison).
 *
 * @param trialsMl one or more titration readings, mL (finite, ≥ 0)
 * @param blankMl titrant used by the alcohol alone (blank), subtracted from the mean; default 0
 * @returns the average and the outlier report
 * @throws RangeError when there are no trials, a trial is negative or not finite, or the blank exceeds the mean
 */
export function titrationAverage(trialsMl: readonly number[], blankMl = 0): TitrationAverage {
  if (trialsMl.length === 0) throw new RangeError('Enter at least one titration trial');
  trialsMl.forEach((t, i) => {
    if (!Number.isFinite(t) || t < 0) throw new RangeError(`Trial ${i + 1} must be a number ≥ 0 mL, got ${t}`);
  });
  if (!Number.isFinite(blankMl) || blankMl < 0) throw new RangeError(`The blank must be ≥ 0 mL, got ${blankMl}`);

  const trials = [...trialsMl];
  const rawMean = mean(trials);
  if (blankMl > rawMean + ML_EPSILON) {
    throw new RangeError(`The blank (${blankMl} mL) exceeds the average of the trials (${rawMean} mL)`);
  }

  const outlierIndexes: number[] = [];
  if (trials.length >= 2) {
    trials.forEach((t, i) => {
      const others = trials.filter((_, j) => j !== i);
      const reference = median(others);
      const threshold = Math.max(OUTLIER_MIN_DIFFERENCE_ML, OUTLIER_RELATIVE_DIFFERENCE * reference);
      if (Math.abs(t - reference) > threshold + ML_EPSILON) outlierIndexes.push(i);
    });
  }

  const kept = trials.filter((_, i) => !outlierIndexes.includes(i));
  const averageWithoutOutliersMl =
    outlierIndexes.length === 0 || kept.length === 0 ? null : Math.max(0, mean(kept) - blankMl);

  return {
    averageMl: Math.max(0, rawMean - blankMl),
    trials,
    outlierIndexes,
    spreadMl: Math.max(...trials) - Math.min(...trials),
    averageWithoutOutliersMl,
    blankMl,
  };
}
