// A distribution-free confidence interval for a median, from order statistics.
//
// For n independent samples of a continuous quantity, the number of samples below the true median
// is Binomial(n, ½). The interval [x₍ₖ₎, x₍ₙ₋ₖ₊₁₎] (1-based order statistics) therefore covers the
// median with probability 1 − 2·P(Bin(n, ½) ≤ k − 1), whatever the distribution (Conover,
// *Practical Nonparametric Statistics*, 3rd ed., 1999, §3.2; Hollander & Wolfe, *Nonparametric
// Statistical Methods*, 1999). We take the largest k whose coverage still reaches the requested
// confidence, so the interval is the narrowest of that family that keeps its promise.
//
// Why this and not a bootstrap: loop-time ratios are skewed and heavy-tailed (a descheduled round
// reads 10× slow), the interval needs no resampling and no random numbers (a verdict must not
// move with a seed), and its coverage is exact rather than asymptotic.

export interface MedianInterval {
  /** Sample median (mean of the two middle values for even n). */
  median: number;
  /** Lower and upper bounds; null when n is too small for the requested confidence. */
  lower: number | null;
  upper: number | null;
  /** Requested two-sided confidence, e.g. 0.95. */
  confidence: number;
  /** Exact coverage of the chosen order statistics (≥ confidence when the bounds exist). */
  coverage: number;
  /** 1-based ranks of the bounds in the sorted sample (0 when the bounds are null). */
  lowerRank: number;
  upperRank: number;
  samples: number;
}

/** P(Bin(n, ½) ≤ k), summed from the lower tail (exact for the n a gate uses, n ≤ 1000). */
export function binomialHalfCdf(n: number, k: number): number {
  if (k < 0) return 0;
  if (k >= n) return 1;
  // C(n, j)·2⁻ⁿ built up term by term in log space: 2⁻¹⁰⁰⁰ underflows a double, the log does not.
  let logTerm = -n * Math.LN2;
  let total = Math.exp(logTerm);
  for (let j = 1; j <= k; j++) {
    logTerm += Math.log((n - j + 1) / j);
    total += Math.exp(logTerm);
  }
  return Math.min(1, total);
}

/** The median of `values` (any order) with its order-statistic interval at `confidence`. */
export function medianInterval(values: ArrayLike<number>, confidence = 0.95): MedianInterval {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence ${confidence}: expected a value between 0 and 1`);
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  if (n === 0) throw new RangeError('medianInterval: no samples');
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(sorted[i])) throw new RangeError(`medianInterval: sample ${sorted[i]} is not finite`);
  }
  const half = n >> 1;
  const median = n % 2 === 1 ? sorted[half] : (sorted[half - 1] + sorted[half]) / 2;
  // Largest k with 1 − 2·P(Bin ≤ k − 1) ≥ confidence; k ≤ ⌈n/2⌉.
  let k = 0;
  let coverage = 0;
  for (let candidate = 1; candidate <= Math.ceil(n / 2); candidate++) {
    const c = 1 - 2 * binomialHalfCdf(n, candidate - 1);
    if (c >= confidence) {
      k = candidate;
      coverage = c;
    } else break;
  }
  if (k === 0) {
    return { median, lower: null, upper: null, confidence, coverage: 1 - 2 * binomialHalfCdf(n, 0), lowerRank: 0, upperRank: 0, samples: n };
  }
  return { median, lower: sorted[k - 1], upper: sorted[n - k], confidence, coverage, lowerRank: k, upperRank: n - k + 1, samples: n };
}

/** Fewest samples for which an interval at `confidence` exists (6 at 95 %, 8 at 99 %). */
export function minimumSamplesFor(confidence: number): number {
  for (let n = 1; n < 10_000; n++) if (1 - 2 * binomialHalfCdf(n, 0) >= confidence) return n;
  throw new RangeError(`confidence ${confidence} needs more than 10,000 samples`);
}

export type TimingJudgement = 'holds' | 'within-noise' | 'exceeds';

/**
 * Against a limit: `exceeds` only when the whole interval lies above it (significant and beyond
 * the limit), `holds` when the whole interval lies at or below it, `within-noise` otherwise
 * (including too few rounds for an interval).
 */
export function judgeAgainstLimit(interval: MedianInterval, limit: number): TimingJudgement {
  if (interval.lower === null || interval.upper === null) return 'within-noise';
  if (interval.lower > limit) return 'exceeds';
  if (interval.upper <= limit) return 'holds';
  return 'within-noise';
}
