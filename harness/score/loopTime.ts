// Loop time of the build's tick: quantiles from a log-spaced histogram (relative resolution, since
// loop times span microseconds to seconds), exact maximum, and the count of ticks over budget.

import { Histogram } from './histogram.js';
import { LOOP_TIME_BIN_RATIO, LOOP_TIME_MAX_us, LOOP_TIME_MIN_us } from './thresholds.js';
import type { LoopTimeMetrics } from './types.js';

export class LoopTimeTracker {
  private readonly histogram = Histogram.logarithmic(LOOP_TIME_MIN_us, LOOP_TIME_MAX_us, LOOP_TIME_BIN_RATIO);
  private overruns = 0;

  constructor(private readonly budget_us: number) {}

  record(loopTime_us: number): void {
    if (!(loopTime_us >= 0)) return; // NaN: tick not timed
    this.histogram.add(loopTime_us);
    if (loopTime_us > this.budget_us) this.overruns++;
  }

  result(): LoopTimeMetrics {
    const timed = this.histogram.count > 0;
    return {
      p50: this.histogram.quantile(0.5),
      p99: this.histogram.quantile(0.99),
      max: timed ? this.histogram.max : null,
      budget: this.budget_us,
      overruns: this.overruns,
    };
  }
}
