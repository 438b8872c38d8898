// Min/max decimation: a signal of any length becomes at most one (min, max) pair per bucket, so a
// plot of ≤ 2 × buckets points still shows every peak and trough (the extremes of each bucket are
// kept, not an average that would flatten a one-tick spike). The streaming form is fed one value per
// tick by the recorder and allocates nothing after construction; NaN marks "no value" (a foot in
// swing) and is skipped.

export class MinMaxBuckets {
  readonly min: Float64Array;
  readonly max: Float64Array;
  private readonly count: Uint32Array;

  constructor(readonly bucketCount: number) {
    this.min = new Float64Array(bucketCount).fill(Number.POSITIVE_INFINITY);
    this.max = new Float64Array(bucketCount).fill(Number.NEGATIVE_INFINITY);
    this.count = new Uint32Array(bucketCount);
  }

  add(bucket: number, value: number): void {
    if (Number.isNaN(value)) return;
    if (value < this.min[bucket]) this.min[bucket] = value;
    if (value > this.max[bucket]) this.max[bucket] = value;
    this.count[bucket]++;
  }

  /** Plain arrays of the first `used` buckets, null where a bucket got no value. */
  toSeries(used: number, digits: number): { min: (number | null)[]; max: (number | null)[] } {
    const min: (number | null)[] = [];
    const max: (number | null)[] = [];
    for (let b = 0; b < used; b++) {
      const has = this.count[b] > 0;
      min.push(has ? round(this.min[b], digits) : null);
      max.push(has ? round(this.max[b], digits) : null);
    }
    return { min, max };
  }
}

/** Ticks per bucket so that `expectedTicks` fill at most `maxBuckets` buckets. */
export function ticksPerBucket(expectedTicks: number, maxBuckets: number): number {
  if (!(maxBuckets >= 1)) throw new RangeError(`buckets: maxBuckets ${maxBuckets} must be ≥ 1`);
  return Math.max(1, Math.ceil(Math.max(1, expectedTicks) / maxBuckets));
}

/** Batch form: values (NaN = none) into ≤ maxBuckets (min, max) pairs. */
export function decimateMinMax(values: ArrayLike<number>, maxBuckets: number): { min: (number | null)[]; max: (number | null)[]; bucketSize: number } {
  const bucketSize = ticksPerBucket(values.length, maxBuckets);
  const used = Math.ceil(values.length / bucketSize);
  const buckets = new MinMaxBuckets(Math.max(1, used));
  for (let i = 0; i < values.length; i++) buckets.add(Math.floor(i / bucketSize), values[i]);
  return { ...buckets.toSeries(used, 17), bucketSize }; // 17 digits: exact for doubles
}

/**
 * Merges neighbouring buckets of an already decimated series down to ≤ target buckets (the report
 * does this to the plot's pixel width): min of the mins, max of the maxes, so peaks still survive.
 * `at` gives the index of the bucket kept for the time axis (the last of each group).
 */
export function rebucket(
  series: { min: (number | null)[]; max: (number | null)[] },
  target: number,
): { min: (number | null)[]; max: (number | null)[]; at: number[] } {
  const { start, end } = groupRanges(series.min.length, target);
  return { ...mergeGroups(series, start, end), at: end.map((e) => e - 1) };
}

/** Min of the mins and max of the maxes over each index range [start[g], end[g]) (nulls skipped). */
export function mergeGroups(
  series: { min: (number | null)[]; max: (number | null)[] },
  start: readonly number[],
  end: readonly number[],
): { min: (number | null)[]; max: (number | null)[] } {
  const min: (number | null)[] = [];
  const max: (number | null)[] = [];
  for (let g = 0; g < start.length; g++) {
    let lo: number | null = null;
    let hi: number | null = null;
    for (let k = start[g]; k < end[g]; k++) {
      const a = series.min[k];
      const b = series.max[k];
      if (a !== null && (lo === null || a < lo)) lo = a;
      if (b !== null && (hi === null || b > hi)) hi = b;
    }
    min.push(lo);
    max.push(hi);
  }
  return { min, max };
}

/** Rounds to `digits` significant digits (keeps files compact; plots need ~4). */
export function round(value: number, digits: number): number {
  if (value === 0 || !Number.isFinite(value)) return value;
  return Number(value.toPrecision(digits));
}

/** Index ranges [start, end) grouping n buckets into ≤ target groups of equal size (last shorter). */
export function groupRanges(n: number, target: number): { start: number[]; end: number[] } {
  const size = ticksPerBucket(n, target);
  const start: number[] = [];
  const end: number[] = [];
  for (let k = 0; k < n; k += size) {
    start.push(k);
    end.push(Math.min(n, k + size));
  }
  return { start, end };
}
