// The whole bench: the plant alone, then every build in turn (one at a time: the machine's other
// core stays free for the process builds' child and for noise). A build that cannot be measured
// becomes a failure entry; the others still run.

import type { OpenBuildOptions } from '../builds/loader.js';
import type { BuildSpec } from '../builds/spec.js';
import { describeMachine } from '../results/runResult.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { TOOL_VERSION } from '../version.js';
import type { TaskBudget } from './batch.js';
import { benchBuild, benchPlant } from './measure.js';
import { BENCH_FORMAT, BENCH_FORMAT_VERSION, type BenchFailure, type BenchReport, type BuildBench } from './types.js';

/** tinybench's own default time budget per task (its `time` option), milliseconds. */
export const DEFAULT_BENCH_TIME_ms = 1000;
/** Minimum tinybench iterations per fast task (tinybench's default is 64; 16 keeps tiny budgets tiny). */
const MIN_ITERATIONS = 16;

export interface BenchOptions {
  scenario: ResolvedScenario;
  builds: BuildSpec[];
  time_ms?: number;
  openOptions?: OpenBuildOptions;
  /** Progress lines (one per figure), e.g. to stderr. */
  log?: (line: string) => void;
}

export async function runBench(options: BenchOptions): Promise<BenchReport> {
  const time_ms = options.time_ms ?? DEFAULT_BENCH_TIME_ms;
  if (!(time_ms > 0) || !Number.isFinite(time_ms)) throw new Error(`bench: time_ms = ${time_ms}, expected a positive number of milliseconds`);
  const budget: TaskBudget = { time_ms, iterations: MIN_ITERATIONS };
  const { scenario } = options;
  const log = options.log ?? (() => undefined);
  const startedAt = new Date().toISOString();

  log(`bench: plant alone (${scenario.plant.robot.id}, ${scenario.plant.robot.hips_m.length} feet in contact)`);
  const plant = await benchPlant(scenario, budget);
  const builds: BuildBench[] = [];
  const failures: BenchFailure[] = [];
  for (const spec of options.builds) {
    log(`bench: ${spec.name} (${spec.text})`);
    try {
      builds.push(await benchBuild(scenario, spec, budget, options.openOptions ?? {}));
    } catch (error) {
      failures.push({ name: spec.name, spec: spec.text, message: error instanceof Error ? error.message : String(error) });
    }
  }
  return {
    format: BENCH_FORMAT,
    formatVersion: BENCH_FORMAT_VERSION,
    toolVersion: TOOL_VERSION,
    startedAt,
    machine: describeMachine(),
    scenario: {
      id: scenario.id,
      file: scenario.file,
      hash: scenario.hash,
      duration_s: scenario.duration_s,
      controlRate_Hz: scenario.control.rate_Hz,
    },
    time_ms,
    plant,
    builds,
    failures,
  };
}
