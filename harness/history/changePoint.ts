// Change points of a night-by-night metric by Pettitt's test (A. N. Pettitt, "A non-parametric
// approach to the change-point problem", Applied Statistics 28(2), 126–135, 1979): for a series
// x_1…x_n, U_t = Σ_{i≤t} Σ_{j>t} sgn(x_i − x_j), K = max_t |U_t|, and the change's significance
// p ≈ 2·exp(−6K² / (n³ + n²)) (Pettitt's eq. 2.11, an upper bound for continuous data, so the
// false-alarm rate is at most α). It is rank-based: no assumption of normal noise, robust to the
// odd outlier night, and ties (a deterministic simulator gives bit-identical nights) score 0.
// Several changes are found by binary segmentation: test the whole series, split at a significant
// change, test each side again (each test at α; a flat series stops after its first test, so its
// false-alarm rate is that one test's), then re-place each change between its neighbours.
//
// Known limit of the method: K weighs splits near the middle most, so a change needs enough
// nights on both sides — a perfect step in the middle needs n ≳ 15 nights to reach p < 0.01
// (2·exp(−0.375 n) < 0.01), and a change in the last few nights of a long window is found only
// when the window is cut (`history report --last N`). The gate line on the page covers those.

export interface ChangePointOptions {
  /** Significance level of each test (default DEFAULT_ALPHA). */
  alpha?: number;
  /** Fewest points on each side of a change (default DEFAULT_MIN_SEGMENT). */
  minSegment?: number;
  /** At most this many changes per series (default DEFAULT_MAX_CHANGES). */
  maxChanges?: number;
}

/** 1 %: one false flag in a hundred flat series (the page shows hundreds of lines; common practice for screening). */
export const DEFAULT_ALPHA = 0.01;
/** Three nights a side: a single odd night is an outlier, not a change (common practice). */
export const DEFAULT_MIN_SEGMENT = 3;
export const DEFAULT_MAX_CHANGES = 5;

export interface PettittResult {
  /** Last index (0-based) of the first segment: the change lies between `at` and `at + 1`. */
  at: number;
  /** K = max |U_t|. */
  statistic: number;
  /** U_at: positive when the later values are lower. */
  u: number;
  p: number;
}

/** Ranks 1…n with ties given their average rank. */
export function averageRanks(values: readonly number[]): number[] {
  const order = values.map((_, i) => i).sort((a, b) => values[a] - values[b]);
  const ranks = new Array<number>(values.length);
  for (let start = 0; start < order.length; ) {
    let end = start;
    while (end + 1 < order.length && values[order[end + 1]] === values[order[start]]) end++;
    const rank = (start + end) / 2 + 1;
    for (let k = start; k <= end; k++) ranks[order[k]] = rank;
    start = end + 1;
  }
  return ranks;
}

/**
 * Pettitt's statistic over the whole series, in O(n log n) by its rank form
 * U_t = 2·Σ_{i≤t} R_i − t(n + 1) (Pettitt 1979, eq. 2.2). Null when n < 2.
 * `minSegment` restricts the candidate split points to those with that many points a side.
 */
export function pettitt(values: readonly number[], minSegment = 1): PettittResult | null {
  const n = values.length;
  if (n < 2 || n < 2 * minSegment) return null;
  const ranks = averageRanks(values);
  let cumulative = 0;
  let best: PettittResult = { at: minSegment - 1, statistic: -1, u: 0, p: 1 };
  for (let t = 1; t < n; t++) {
    cumulative += ranks[t - 1];
    if (t < minSegment || n - t < minSegment) continue;
    const u = 2 * cumulative - t * (n + 1);
    if (Math.abs(u) > best.statistic) best = { at: t - 1, statistic: Math.abs(u), u, p: 1 };
  }
  const k = best.statistic;
  best.p = Math.min(1, 2 * Math.exp((-6 * k * k) / (n ** 3 + n ** 2)));
  return best;
}

export interface ChangePoint {
  /** Index (into the series given) of the last point before the change. */
  before: number;
  /** Index of the first point after it. */
  after: number;
  p: number;
  statistic: number;
  /** Median after − median before, within the tested segment. */
  shift: number;
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Every change binary segmentation finds at level α, in series order. */
export function detectChangePoints(values: readonly number[], options: ChangePointOptions = {}): ChangePoint[] {
  const alpha = options.alpha ?? DEFAULT_ALPHA;
  const minSegment = options.minSegment ?? DEFAULT_MIN_SEGMENT;
  const maxChanges = options.maxChanges ?? DEFAULT_MAX_CHANGES;
  const found: ChangePoint[] = [];
  const pending: [number, number][] = [[0, values.length]];
  while (pending.length > 0 && found.length < maxChanges) {
    const [from, to] = pending.shift() as [number, number];
    const segment = values.slice(from, to);
    const test = pettitt(segment, minSegment);
    if (test === null || !(test.p < alpha)) continue;
    const split = from + test.at + 1;
    found.push({
      before: split - 1,
      after: split,
      p: test.p,
      statistic: test.statistic,
      shift: median(values.slice(split, to)) - median(values.slice(from, split)),
    });
    pending.push([from, split], [split, to]);
  }
  found.sort((a, b) => a.before - b.before);
  // Refinement: with two changes of like size the first split may land between them (every split
  // there scores about the same); each change is re-placed by the test on the stretch between its
  // neighbours, where it is the only change.
  for (let k = 0; k < found.length; k++) {
    const from = k === 0 ? 0 : found[k - 1].after;
    const to = k === found.length - 1 ? values.length : found[k + 1].after;
    const test = pettitt(values.slice(from, to), minSegment);
    if (test === null || !(test.p < alpha)) continue;
    const split = from + test.at + 1;
    found[k] = { before: split - 1, after: split, p: test.p, statistic: test.statistic, shift: median(values.slice(split, to)) - median(values.slice(from, split)) };
  }
  return found;
}
