// The history store's bench figure (`footing bench --history`, part of `npm run bench`): a year of
// generated nights (generate.ts: 365 nights × 200 scenarios × 3 builds, invented data) loaded
// into a fresh store one transaction per night, then, timed by tinybench, the trend query of one
// scenario — every trend metric of every build, what its section of the trend page reads — and the
// store file's size. Targets (issue 19): the query under 1 s, the file under 200 MB.

import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { measureTask } from '../bench/batch.js';
import type { TimingStats } from '../bench/types.js';
import { generateNight, scenarioId, type GenerateOptions } from './generate.js';
import { TREND_METRICS } from './metrics.js';
import { openSqliteStore } from './sqliteStore.js';

export const HISTORY_BENCH_SHAPE = { nights: 365, scenarios: 200, builds: 3 } as const;

export interface HistoryBenchFigures {
  nights: number;
  scenarios: number;
  builds: number;
  runs: number;
  metricValues: number;
  load_s: number;
  fileSize_MB: number;
  /** All trend lines of one scenario (TREND_METRICS × builds), tinybench statistics per query. */
  scenarioTrend: TimingStats;
  /** One line (one metric, one build). */
  lineTrend: TimingStats;
  peakRss_MB: number;
}

export async function benchHistory(options: { nights?: number; scenarios?: number; builds?: number; time_ms?: number; log?: (line: string) => void } = {}): Promise<HistoryBenchFigures> {
  const shape: GenerateOptions = {
    nights: options.nights ?? HISTORY_BENCH_SHAPE.nights,
    scenarios: options.scenarios ?? HISTORY_BENCH_SHAPE.scenarios,
    builds: options.builds ?? HISTORY_BENCH_SHAPE.builds,
    seed: 1,
  };
  const folder = mkdtempSync(path.join(tmpdir(), 'footing-history-bench-'));
  const file = path.join(folder, 'history.sqlite');
  try {
    let store = openSqliteStore(file);
    let runs = 0;
    const started = performance.now();
    for (let k = 0; k < shape.nights; k++) {
      const night = generateNight(shape, k);
      runs += night.runs.length;
      store.add(night);
      if ((k + 1) % 50 === 0) options.log?.(`history bench: ${k + 1}/${shape.nights} nights loaded`);
    }
    const load_s = (performance.now() - started) / 1000;
    // Closing folds the write-ahead log into the file: its size is then the store's.
    store.close();
    const fileSize_MB = statSync(file).size / 1e6;
    store = openSqliteStore(file, { readonly: true });
    const metricValues = store.counts().values;
    const budget = { time_ms: options.time_ms ?? 1000, iterations: 5 };
    let k = 0;
    const nextScenario = () => scenarioId(k++ % shape.scenarios);
    const scenarioTrend = await measureTask('history trend of one scenario', () => {
      const scenario = nextScenario();
      let points = 0;
      for (let b = 0; b < shape.builds; b++) for (const m of TREND_METRICS) points += store.trend({ scenario, build: `build-${b}`, metric: m.metric }).length;
      if (points !== shape.builds * TREND_METRICS.length * shape.nights) throw new Error(`trend query returned ${points} points`);
    }, 1, budget);
    const lineTrend = await measureTask('history trend of one line', () => {
      store.trend({ scenario: nextScenario(), build: 'build-0', metric: 'stanceMargin.min' });
    }, 1, budget);
    store.close();
    return { ...shape, runs, metricValues, load_s, fileSize_MB, scenarioTrend, lineTrend, peakRss_MB: process.resourceUsage().maxRSS / 1024 } as HistoryBenchFigures;
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

export function renderHistoryBench(f: HistoryBenchFigures): string[] {
  const ms = (us: number) => (us / 1000).toFixed(1);
  return [
    `history store: ${f.nights} nights × ${f.scenarios} scenarios × ${f.builds} builds = ${f.runs} runs, ${f.metricValues} metric values (generated): ` +
      `loaded in ${f.load_s.toFixed(1)} s (one transaction per night), file ${f.fileSize_MB.toFixed(1)} MB (target < 200 MB)`,
    `history trend query, one scenario (${TREND_METRICS.length} metrics × ${f.builds} builds × ${f.nights} nights): mean ${ms(f.scenarioTrend.mean_us)} ms, p99 ${ms(f.scenarioTrend.p99_us)} ms (target < 1000 ms); ` +
      `one line: mean ${ms(f.lineTrend.mean_us)} ms; peak memory ${f.peakRss_MB.toFixed(0)} MB`,
  ];
}
