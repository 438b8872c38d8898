// Friction margin of the true ground force: m = 1 − |f_t| / (μs·f_n) with f_n the normal (z)
// component, f_t the tangential (x, y) part and μs the true static friction under the foot.
// m = 1: no tangential load; m = 0: on the Coulomb cone; m < 0: outside it (sliding, transient).
// Every physics step of a loaded foot is one sample (no sample depends on where ticks fall); a
// landing substep is a sample of weight 1/K (the step's stepWeight), so percentiles are per unit
// of time, not per integration. The step pass (stepPass.ts) applies the law in its loop.

import { Histogram } from './histogram.js';
import { MARGIN_BIN_WIDTH, MARGIN_FLOOR } from './thresholds.js';
import type { FrictionMarginMetrics, MarginStats } from './types.js';

/** Margin of one ground force; friction μs ≤ 0 (a frictionless patch) holds no tangential load. */
export function frictionMargin(fx_N: number, fy_N: number, fz_N: number, staticFriction: number): number {
  const tangential_N = Math.sqrt(fx_N * fx_N + fy_N * fy_N);
  const capacity_N = staticFriction * fz_N;
  const margin = capacity_N > 0 ? 1 - tangential_N / capacity_N : tangential_N === 0 ? 1 : MARGIN_FLOOR;
  return margin < MARGIN_FLOOR ? MARGIN_FLOOR : margin;
}

/**
 * The per-foot histograms of loaded margins outside stance (touchdown transients, loaded legs in
 * swing mode), filled by the step pass (stepPass.ts); the stance samples are in the touchdown
 * tracker's stance histograms. Each sample is added once, to one of the two, and the margin's
 * statistics merge both: exactly, since every weight is 1 or 1/2^k (a landing's K is a power of
 * two), so every bin's sum is exact in any order.
 */
export class FrictionMarginTracker {
  readonly outsideStance: Histogram[] = [];

  constructor(footCount: number) {
    for (let i = 0; i < footCount; i++) this.outsideStance.push(FrictionMarginTracker.marginHistogram());
  }

  /** A histogram with the margin bins (the stance histograms share them, so one bin index serves both). */
  static marginHistogram(): Histogram {
    return Histogram.linear(MARGIN_FLOOR, 1, MARGIN_BIN_WIDTH);
  }

  /** Per foot: these samples and `stance[i]`'s; overall: every foot's (same bins throughout). */
  result(stance: readonly Histogram[]): FrictionMarginMetrics {
    const perFoot = this.outsideStance.map((outside, i) => {
      const foot = outside.emptyCopy();
      foot.addAll(outside);
      foot.addAll(stance[i]);
      return foot;
    });
    const all = FrictionMarginTracker.marginHistogram();
    for (const foot of perFoot) all.addAll(foot);
    return { ...marginStats(all), perFoot: perFoot.map(marginStats) };
  }
}

export function marginStats(histogram: Histogram): MarginStats {
  return {
    min: histogram.count > 0 ? histogram.min : null,
    p05: histogram.quantile(0.05),
    loadedSamples: histogram.count,
  };
}
