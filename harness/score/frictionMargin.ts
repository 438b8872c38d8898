// Friction margin of the true ground force: m = 1 − |f_t| / (μs·f_n) with f_n the normal (z)
// component, f_t the tangential (x, y) part and μs the true static friction under the foot.
// m = 1: no tangential load; m = 0: on the Coulomb cone; m < 0: outside it (sliding, transient).
// Every physics step of a loaded foot is one sample (no sample depends on where ticks fall); a
// landing substep is a sample of weight 1/K (the step's stepWeight), so percentiles are per unit
// of time, not per integration.

import { Histogram } from './histogram.js';
import type { StepView } from './sample.js';
import { MARGIN_BIN_WIDTH, MARGIN_FLOOR } from './thresholds.js';
import type { FrictionMarginMetrics, MarginStats } from './types.js';

/** Margin of one ground force; friction μs ≤ 0 (a frictionless patch) holds no tangential load. */
export function frictionMargin(fx_N: number, fy_N: number, fz_N: number, staticFriction: number): number {
  const tangential_N = Math.sqrt(fx_N * fx_N + fy_N * fy_N);
  const capacity_N = staticFriction * fz_N;
  const margin = capacity_N > 0 ? 1 - tangential_N / capacity_N : tangential_N === 0 ? 1 : MARGIN_FLOOR;
  return margin < MARGIN_FLOOR ? MARGIN_FLOOR : margin;
}

export class FrictionMarginTracker {
  private readonly perFoot: Histogram[];
  /**
   * Each foot's margin at the last step recorded when it was loaded, NaN when it was not (only
   * loaded samples are scored); the stance split reuses it.
   */
  readonly margins: Float64Array;
  /** The margin histograms' bin of each loaded foot's margin (same bins as the stance split's). */
  readonly marginBins: Int32Array;
  /** MARGIN_FLOOR read once: an imported binding read in the loop cost a heap number per foot (measured). */
  private readonly floor: number = MARGIN_FLOOR;
  /** Histogram.binOf of the margin histograms, written out in the loop (same operations). */
  private readonly binWidth: number = MARGIN_BIN_WIDTH;
  private readonly lastBin: number;
  /** The step's weight, in an array so that it crosses calls unboxed (Histogram.addBinnedWeightedFrom). */
  readonly weight = new Float64Array(1);

  constructor(
    private readonly footCount: number,
    private readonly loadedThreshold_N: number,
  ) {
    this.perFoot = [];
    this.margins = new Float64Array(footCount);
    this.marginBins = new Int32Array(footCount);
    for (let i = 0; i < footCount; i++) this.perFoot.push(FrictionMarginTracker.marginHistogram());
    this.lastBin = FrictionMarginTracker.marginHistogram().counts.length - 1;
  }

  /** A histogram with the bins of `marginBins` (for a tracker that shares them). */
  static marginHistogram(): Histogram {
    return Histogram.linear(MARGIN_FLOOR, 1, MARGIN_BIN_WIDTH);
  }

  recordStep(sample: StepView): void {
    const force = sample.footGroundForce_N;
    this.fillMargins(force, sample.footStaticFriction);
    this.weight[0] = sample.stepWeight;
    for (let i = 0; i < this.footCount; i++) {
      if (force[3 * i + 2] > this.loadedThreshold_N) this.perFoot[i].addBinnedWeightedFrom(this.marginBins, this.margins, i, this.weight);
    }
  }

  /**
   * frictionMargin() of every loaded foot into `margins` (NaN for the others, which no tracker
   * scores), and its bin into `marginBins`: the same law written out for the per-step loop, with
   * if/else on local doubles so that V8 keeps every value unboxed.
   */
  private fillMargins(force_N: Float64Array, staticFriction: Float64Array): void {
    const floor = this.floor;
    const width = this.binWidth;
    const last = this.lastBin;
    const out = this.margins;
    const threshold_N = this.loadedThreshold_N;
    for (let i = 0; i < this.footCount; i++) {
      const fz = force_N[3 * i + 2];
      if (!(fz > threshold_N)) {
        out[i] = Number.NaN;
        continue;
      }
      const fx = force_N[3 * i];
      const fy = force_N[3 * i + 1];
      const tangential_N = Math.sqrt(fx * fx + fy * fy);
      const capacity_N = staticFriction[i] * fz;
      let margin = floor;
      if (capacity_N > 0) margin = 1 - tangential_N / capacity_N;
      else if (tangential_N === 0) margin = 1;
      const clamped = margin < floor ? floor : margin;
      out[i] = clamped;
      const bin = Math.floor((clamped - floor) / width);
      this.marginBins[i] = bin < 0 ? 0 : bin > last ? last : bin;
    }
  }

  /** The overall statistics merge the per-foot histograms (same bins), so record() adds once. */
  result(): FrictionMarginMetrics {
    const all = FrictionMarginTracker.marginHistogram();
    for (const foot of this.perFoot) all.addAll(foot);
    return { ...marginStats(all), perFoot: this.perFoot.map(marginStats) };
  }
}

export function marginStats(histogram: Histogram): MarginStats {
  return {
    min: histogram.count > 0 ? histogram.min : null,
    p05: histogram.quantile(0.05),
    loadedSamples: histogram.count,
  };
}
