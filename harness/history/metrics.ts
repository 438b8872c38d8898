// Which numbers of a run the history keeps: every scalar of its `metrics` and `sim`, and the
// margin searches' critical scales, under the metric paths the gate and docs/scoring.md use
// (`frictionMargin.min`, `loopTime_us.p99`, …). Per-foot breakdowns stay in results.json: the
// trend of a night is read per run, and per-foot lines would multiply the store by the leg count.
// Booleans are stored as 0/1; strings (fallReason) are not metrics.

import type { RunResult } from '../results/types.js';

const SKIPPED_KEYS = new Set(['perFoot', 'slipDistancePerFoot_m']);

function collect(prefix: string, value: unknown, out: [string, number][]): void {
  if (typeof value === 'number') {
    if (Number.isFinite(value)) out.push([prefix, value]);
  } else if (typeof value === 'boolean') {
    out.push([prefix, value ? 1 : 0]);
  } else if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const [key, inner] of Object.entries(value)) {
      if (SKIPPED_KEYS.has(key)) continue;
      collect(prefix === '' ? key : `${prefix}.${key}`, inner, out);
    }
  }
}

/** The run's metric paths and values; a null (unmeasured) value is simply absent. */
export function runMetricValues(run: RunResult): [string, number][] {
  const out: [string, number][] = [];
  if (run.metrics) collect('', run.metrics, out);
  if (run.sim) collect('sim', run.sim, out);
  const friction = run.margin?.friction?.criticalScale;
  const push = run.margin?.push?.criticalScale;
  if (typeof friction === 'number') out.push(['margin.friction.criticalScale', friction]);
  if (typeof push === 'number') out.push(['margin.push.criticalScale', push]);
  return out;
}

/** The metrics the trend page draws, in this order; each is the metric of a gate rule (limits.ts). */
export const TREND_METRICS = [
  { metric: 'stanceMargin.min', label: 'stance friction margin, min', decimals: 3, higherIsBetter: true },
  { metric: 'stanceMargin.p05', label: 'stance friction margin, p05', decimals: 3, higherIsBetter: true },
  { metric: 'slipDistance_m', label: 'slip distance (m)', decimals: 4, higherIsBetter: false },
  { metric: 'violations.commanded', label: 'commanded cone violations', decimals: 0, higherIsBetter: false },
  { metric: 'fell', label: 'fell (1 = yes)', decimals: 0, higherIsBetter: false },
  { metric: 'loopTime_us.p99', label: 'loop time p99 (µs)', decimals: 1, higherIsBetter: false },
] as const;

export type TrendMetric = (typeof TREND_METRICS)[number];
