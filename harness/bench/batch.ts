// One measurement = one tinybench task. A call that takes a microsecond is below what a single
// performance.now() pair resolves well, so fast calls run in batches: one tinybench sample times
// `batch` calls, and the statistics are divided by `batch` to read per call (the same trade-off
// tinybench's own docs suggest for sub-microsecond work). Slow calls (an episode) use batch 1.

import { Bench, type Fn, type FnOptions, type Statistics } from 'tinybench';
import type { RateFigure, TaskBudget, TimingStats } from './types.js';

export type { TaskBudget } from './types.js';

/** Runs one tinybench task and returns its latency statistics in microseconds per call. */
export async function measureTask(name: string, fn: Fn, batch: number, budget: TaskBudget, hooks: FnOptions = {}): Promise<TimingStats> {
  const bench = new Bench({
    name,
    time: budget.time_ms,
    iterations: budget.iterations,
    warmupTime: Math.max(1, budget.time_ms / 4),
    warmupIterations: Math.max(1, Math.min(16, budget.iterations)),
    throws: true,
  });
  bench.add(name, fn, hooks);
  await bench.run();
  const result = bench.tasks[0].result;
  if (result.state === 'errored') throw result.error;
  if (result.state !== 'completed' && result.state !== 'aborted-with-statistics') {
    throw new Error(`bench task '${name}' ended in state '${result.state}'`);
  }
  return perCall(result.latency, batch);
}

/** tinybench latency (milliseconds per sample) → microseconds per call. */
export function perCall(latency: Statistics, batch: number): TimingStats {
  const scale = 1000 / batch;
  return {
    mean_us: latency.mean * scale,
    p50_us: latency.p50 * scale,
    p99_us: latency.p99 * scale,
    rme_percent: latency.rme,
    samples: latency.samplesCount,
    batch,
  };
}

export function rateFigure(stats: TimingStats, controlRate_Hz: number): RateFigure {
  const perSecond = 1e6 / stats.mean_us;
  return { ...stats, perSecond, perControlPeriod: perSecond / controlRate_Hz };
}
