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

/**
 * MinMaxBuckets for several channels in one flat store (channel c's bucket b at c·buckets + b):
 * the recorder folds a tick's whole telemetry vector in one loop, without a call per channel.
 */
export class MinMaxBank {
  readonly min: Float64Array;
  readonly max: Float64Array;
  readonly count: Uint32Array;

  constructor(
    readonly channels: number,
    readonly bucketCount: number,
  ) {
    this.min = new Float64Array(channels * bucketCount).fill(Number.POSITIVE_INFINITY);
    this.max = new Float64Array(channels * bucketCount).fill(Number.NEGATIVE_INFINITY);
    this.count = new Uint32Array(channels * bucketCount);
  }

  /** values[0 … channels − 1] into bucket b (NaN skipped), as MinMaxBuckets.add per channel. */
  addAll(bucket: number, values: ArrayLike<number>): void {
    const min = this.min, max = this.max, count = this.count, stride = this.bucketCount;
    for (let c = 0, at = bucket; c < this.channels; c++, at += stride) {
      const value = values[c];
      if (value !== value) continue; // NaN
      if (value < min[at]) min[at] = value;
      if (value > max[at]) max[at] = value;
      count[at]++;
    }
  }

  /** MinMaxBuckets.toSeries of one channel. */
  toSeries(channel: number, used: number, digits: number): { min: (number | null)[]; max: (number | null)[] } {
    const min: (number | null)[] = [];
    const max: (number | null)[] = [];
    const o = channel * this.bucketCount;
    for (let b = 0; b < used; b++) {
      const has = this.count[o + b] > 0;
      min.push(has ? round(this.min[o + b], digits) : null);
      max.push(has ? round(this.max[o + b], digits) : null);
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

/** 10^k for k = 0 … 22: every one exactly a double. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * Rounds to `digits` significant digits (keeps files compact; plots need ~4): exactly
 * Number(value.toPrecision(digits)), without its string. The d-digit integer n nearest to
 * |value|·10^k is found in floating point, and n / 10^k (or n · 10^−k), both exact doubles, is
 * one correctly rounded IEEE operation, as Number() of the decimal is. |value|·10^k < 10^8 carries
 * an error below 10^8·2^−53 ≈ 1.1e-8, so n is certain unless the fraction is within 1e-7 of a half
 * (a tie, which toPrecision breaks upward): then, and for more than 8 digits or a scale beyond
 * 10^22, it falls back to toPrecision. test/score/series/round.test.ts compares the two on 10^6 values.
 */
export function round(value: number, digits: number): number {
  if (value === 0 || !Number.isFinite(value)) return value;
  const magnitude = value < 0 ? -value : value;
  const k = digits - 1 - Math.floor(Math.log10(magnitude)); // scale that gives `digits` integer digits
  if (digits >= 1 && digits <= 8 && k >= -22 && k <= 22) {
    const scaled = k >= 0 ? magnitude * POWERS_OF_TEN[k] : magnitude / POWERS_OF_TEN[-k];
    const whole = Math.floor(scaled);
    const fraction = scaled - whole;
    const n = fraction >= 0.5 ? whole + 1 : whole;
    const fromTie = fraction - 0.5;
    if ((fromTie > 1e-7 || fromTie < -1e-7) && n >= POWERS_OF_TEN[digits - 1] && n < POWERS_OF_TEN[digits]) {
      const rounded = k >= 0 ? n / POWERS_OF_TEN[k] : n * POWERS_OF_TEN[-k];
      return value < 0 ? -rounded : rounded;
    }
  }
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
