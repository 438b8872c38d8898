// A fixed-size histogram for streaming quantiles: memory is set at construction, add() allocates
// nothing, and quantiles follow the same convention as simple-statistics' `quantile` (linear
// interpolation between order statistics, "type 7") with each order statistic replaced by the
// midpoint of the bin that holds it, clamped to the exact min and max.
//
// Weighted samples (addWeightedFrom): each value counts with a weight, and the quantiles are
// those of the weighted distribution — rank r is where the cumulative weight passes r, and the
// p-quantile sits at rank (W − 1)·p with W the total weight — which with unit weights is the
// type-7 rule above exactly. The plant's landing substeps are scored this way, each with its share
// of a physics step, so that a percentile does not depend on how many substeps a landing takes.
//
// Resolution: for linear bins of width w, every quantile of values inside [lo, hi] is within w/2
// of the exact one; for log bins with edge ratio r, within a factor √r of it. Values outside the
// range fall into the first or last bin (their estimate is still clamped to the exact extremes).

export class Histogram {
  /** Weight per bin (the sample count when every weight is 1). */
  readonly counts: Float64Array;
  /** Number of samples added. */
  count = 0;
  /** Total weight of the samples (equal to count when every weight is 1). */
  weight = 0;
  min = Number.POSITIVE_INFINITY;
  max = Number.NEGATIVE_INFINITY;
  private readonly logarithmic: boolean;
  private readonly origin: number;
  /** Bin width (linear) or ln(ratio) (log). */
  private readonly step: number;

  private constructor(logarithmic: boolean, origin: number, step: number, binCount: number) {
    this.logarithmic = logarithmic;
    this.origin = origin;
    this.step = step;
    this.counts = new Float64Array(binCount);
  }

  /** Bins [lo + k·w, lo + (k+1)·w) covering [lo, hi]. */
  static linear(lo: number, hi: number, binWidth: number): Histogram {
    if (!(hi > lo) || !(binWidth > 0)) throw new RangeError(`histogram: need lo < hi and binWidth > 0`);
    return new Histogram(false, lo, binWidth, Math.ceil((hi - lo) / binWidth - 1e-9));
  }

  /** Bins [lo·r^k, lo·r^(k+1)) covering [lo, hi]; lo > 0. */
  static logarithmic(lo: number, hi: number, ratio: number): Histogram {
    if (!(lo > 0) || !(hi > lo) || !(ratio > 1)) throw new RangeError(`histogram: need 0 < lo < hi and ratio > 1`);
    const step = Math.log(ratio);
    return new Histogram(true, lo, step, Math.ceil(Math.log(hi / lo) / step - 1e-9));
  }

  add(value: number): void {
    if (value !== value) return; // NaN carries no rank
    this.count++;
    this.weight++;
    if (value < this.min) this.min = value;
    if (value > this.max) this.max = value;
    this.counts[this.binOf(value)]++;
  }

  /**
   * add(values[index]): for hot loops, where passing a double to a call V8 does not inline would
   * box it (a heap number per call); an array and an index cross the call without allocating.
   */
  addFrom(values: Float64Array, index: number): void {
    const value = values[index];
    if (value !== value) return;
    this.count++;
    this.weight++;
    if (value < this.min) this.min = value;
    if (value > this.max) this.max = value;
    this.counts[this.binOf(value)]++;
  }

  /**
   * addFrom with the weight weights[0] (> 0): the weight, too, crosses the call in an array, so a
   * fractional weight is never boxed.
   */
  addWeightedFrom(values: Float64Array, index: number, weights: Float64Array): void {
    const value = values[index];
    if (value !== value) return;
    const w = weights[0];
    this.count++;
    this.weight += w;
    if (value < this.min) this.min = value;
    if (value > this.max) this.max = value;
    this.counts[this.binOf(value)] += w;
  }

  /**
   * addWeightedFrom into bin bins[index], which binOf gave for that value on these bins or on a
   * histogram with the same bins (sameBins): two trackers binning one value share the division.
   */
  addBinnedWeightedFrom(bins: Int32Array, values: Float64Array, index: number, weights: Float64Array): void {
    const value = values[index];
    if (value !== value) return;
    const w = weights[0];
    this.count++;
    this.weight += w;
    if (value < this.min) this.min = value;
    if (value > this.max) this.max = value;
    this.counts[bins[index]] += w;
  }

  /** Whether `other` has exactly these bins (so a bin index of one is the same bin of the other). */
  sameBins(other: Histogram): boolean {
    return other.logarithmic === this.logarithmic && other.origin === this.origin && other.step === this.step && other.counts.length === this.counts.length;
  }

  /** The p-quantile (0 ≤ p ≤ 1), or null when empty. */
  quantile(p: number): number | null {
    if (this.count === 0) return null;
    if (p <= 0) return this.min;
    if (p >= 1) return this.max;
    const index = this.weight > 1 ? (this.weight - 1) * p : 0;
    const lower = Math.floor(index);
    const fraction = index - lower;
    const lowerValue = this.orderStatistic(lower);
    if (fraction === 0) return lowerValue;
    return lowerValue + fraction * (this.orderStatistic(lower + 1) - lowerValue);
  }

  /** Adds every value of `other`, which must have the same bins (e.g. per-foot into overall). */
  addAll(other: Histogram): void {
    if (!this.sameBins(other)) {
      throw new RangeError('histogram: cannot merge histograms with different bins');
    }
    for (let k = 0; k < this.counts.length; k++) this.counts[k] += other.counts[k];
    this.count += other.count;
    this.weight += other.weight;
    if (other.min < this.min) this.min = other.min;
    if (other.max > this.max) this.max = other.max;
  }

  /** An empty histogram with the same bins. */
  emptyCopy(): Histogram {
    return new Histogram(this.logarithmic, this.origin, this.step, this.counts.length);
  }

  reset(): void {
    this.counts.fill(0);
    this.count = 0;
    this.weight = 0;
    this.min = Number.POSITIVE_INFINITY;
    this.max = Number.NEGATIVE_INFINITY;
  }

  /** The bin that holds `value` (out-of-range values in the first or last). */
  binOf(value: number): number {
    const last = this.counts.length - 1;
    const k = this.logarithmic
      ? value > this.origin
        ? Math.floor(Math.log(value / this.origin) / this.step)
        : 0
      : Math.floor((value - this.origin) / this.step);
    return k < 0 ? 0 : k > last ? last : k;
  }

  private binMidpoint(k: number): number {
    return this.logarithmic
      ? this.origin * Math.exp((k + 0.5) * this.step)
      : this.origin + (k + 0.5) * this.step;
  }

  /** Estimate of the (rank+1)-th smallest value (rank is 0-based). */
  private orderStatistic(rank: number): number {
    let cumulative = 0;
    const counts = this.counts;
    for (let k = 0; k < counts.length; k++) {
      cumulative += counts[k];
      if (cumulative > rank) {
        const mid = this.binMidpoint(k);
        return mid < this.min ? this.min : mid > this.max ? this.max : mid;
      }
    }
    return this.max;
  }
}
