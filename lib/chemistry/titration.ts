/**
 * Critical values of Dixon's Q test at 90 % confidence, by number of trials (3–10).
 * Dean & Dixon, Anal. Chem. 23 (1951) 636; values as tabulated by Rorabacher, Anal. Chem. 63
 * (1991) 139 (from memory). With fewer than 3 trials no trial can be singled out.
 */
export const DIXON_Q90: Readonly<Record<number, number>> = {
  3: 0.941,
  4: 0.765,
  5: 0.642,
  6: 0.56,
  7: 0.507,
  8: 0.468,
  9: 0.437,
  10: 0.412,
};

/**
 * Trials further apart than this (largest − smallest) call for another titration, mL.
 * Common practice, with its reason: with a 1 g/L titrant 1 mL per mL of oil is 1 g of catalyst
 * per litre — about 8–15 % of a usual dose of 6.5–13 g/L — more than a careful brewer accepts
 * from reading error alone.
 */
export const SPREAD_RETITRATE_ML = 1.0; // common practice (reason above)

/** Tolerance for floating-point comparisons of millilitre readings. */
const ML_EPSILON = 1e-9;

/** Averaged titration trials. */
export interface TitrationAverage {
  /** Mean of all trials minus the blank, mL of titrant per mL of oil (= g catalyst per L oil with a 1 g/L titrant). */
  averageMl: number;
  /** The trials as given, mL. */
  trials: number[];
  /** Indexes (0-based) of the trial that Dixon's Q test (90 %) singles out; at most one, none with fewer than 3 trials. */
  outlierIndexes: number[];
  /** Largest minus smallest trial, mL. */
  spreadMl: number;
  /** True when the spread exceeds {@link SPREAD_RETITRATE_ML}. */
  spreadTooWide: boolean;
  /** Mean of the trials that are not outliers, minus the blank; null when no trial is flagged. */
  averageWithoutOutliersMl: number | null;
  /** The blank subtracted from the mean, mL. */
  blankMl: number;
  /** What the brewer should know about the trials (one wording everywhere), or null when nothing. */
  notice: string | null;
}

function mean(values: readonly number[]): number {
  return values.reduce((acc, v) => acc + v, 0) / values.length;
}

/** "Trial 3" / "Trials 1 and 3" / "Trials 1, 2 and 3" (0-based indexes in). */
export function trialsPhrase(indexes: readonly number[]): string {
  const n = indexes.map((i) => String(i + 1));
  if (n.length <= 1) return `Trial ${n[0] ?? ''}`;
  return `Trials ${n.slice(0, -1).join(', ')} and ${n[n.length - 1]}`;
}

/**
 * Dixon's Q test for the single most extreme trial: Q = gap to its nearest neighbour ÷ range.
 * @returns the index flagged, or null
 */
function dixonOutlier(trials: readonly number[]): number | null {
  const critical = DIXON_Q90[trials.length];
  if (critical === undefined) return null;
  const order = trials.map((v, i) => ({ v, i })).sort((a, b) => a.v - b.v);
  const range = order[order.length - 1]!.v - order[0]!.v;
  if (range <= ML_EPSILON) return null;
  const lowGap = order[1]!.v - order[0]!.v;
  const highGap = order[order.length - 1]!.v - order[order.length - 2]!.v;
  const [gap, idx] = highGap >= lowGap ? [highGap, order[order.length - 1]!.i] : [lowGap, order[0]!.i];
  return gap / range > critical + ML_EPSILON ? idx : null;
}

/**
 * Averages titration trials (mL of 1 g/L catalyst solution per mL of oil) and says when to
 * titrate again.
 *
 * - Outlier: Dixon's Q test at 90 % confidence (Dean & Dixon 1951; critical values from
 *   Rorabacher 1991, from memory) for 3–10 trials singles out at most one trial — ordinary
 *   scatter is never called an outlier. Flagged trials stay in `averageMl`; the brewer decides
 *   (`averageWithoutOutliersMl` is given for comparison).
 * - Spread: trials more than 1.0 mL apart (common practice, see {@link SPREAD_RETITRATE_ML})
 *   ask for another titration, whether or not one trial stands out.
 *
 * @param trialsMl one or more titration readings, mL (finite, ≥ 0)
 * @param blankMl titrant used by the alcohol alone (blank), subtracted from the mean; default 0
 * @returns the average, the outlier and spread report, and a notice
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

  const flagged = dixonOutlier(trials);
  const outlierIndexes = flagged === null ? [] : [flagged];
  const kept = trials.filter((_, i) => i !== flagged);
  const averageWithoutOutliersMl = flagged === null ? null : Math.max(0, mean(kept) - blankMl);
  const spreadMl = Math.max(...trials) - Math.min(...trials);
  const spreadTooWide = spreadMl > SPREAD_RETITRATE_ML + ML_EPSILON;

  let notice: string | null = null;
  if (flagged !== null) {
    notice = `${trialsPhrase(outlierIndexes)} (${trials[flagged]} mL) stands apart from the others (Dixon's Q test, 90 %): titrate again before relying on the average.`;
  } else if (spreadTooWide) {
    notice = `The trials are ${spreadMl.toFixed(2)} mL apart (more than ${SPREAD_RETITRATE_ML.toFixed(1)} mL): titrate again before relying on the average.`;
  }

  return {
    averageMl: Math.max(0, rawMean - blankMl),
    trials,
    outlierIndexes,
    spreadMl,
    spreadTooWide,
    averageWithoutOutliersMl,
    blankMl,
    notice,
  };
}
