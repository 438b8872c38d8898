// What `footing bench` measures and writes (bench.schema.json is its JSON Schema; BENCH_FORMAT_VERSION
// the one place its version lives). Rates are per second of wall time; every figure comes from a
// tinybench task whose statistics are kept as tinybench reports them, converted to one call.

import type { BuildSpec } from '../builds/spec.js';
import type { MachineInfo } from '../results/types.js';
import type { ResolvedScenario } from '../scenario/types.js';

export const BENCH_FORMAT = 'footing-bench';
export const BENCH_FORMAT_VERSION = 1;

/**
 * tinybench statistics of one task, per call. Fast calls are timed in batches (one tinybench
 * sample = `batch` calls, see batch.ts), so mean/p50/p99 are of the per-call average within a batch.
 */
export interface TimingStats {
  mean_us: number;
  p50_us: number;
  p99_us: number;
  /** Relative margin of error of the mean, percent (tinybench `rme`: 95 % confidence half-width). */
  rme_percent: number;
  /** tinybench samples (iterations). */
  samples: number;
  /** Calls per sample. */
  batch: number;
}

export interface RateFigure extends TimingStats {
  /** Calls per second, 1e6 / mean_us. */
  perSecond: number;
  /** perSecond ÷ the scenario's control rate: how many calls fit in one control period. */
  perControlPeriod: number;
}

export interface PlantBench {
  robot: string;
  footCount: number;
  step_s: number;
  /** Every foot touched the ground at the end of the measurement (the intended load case). */
  allFeetInContact: boolean;
  steps: RateFigure;
  stepsPerSecond: number;
  /** Simulated seconds per wall second: stepsPerSecond · step_s. */
  realTimeFactor: number;
}

export interface ProtocolOverhead {
  /** Round trip minus the build's reported compute time, per tick (process builds). */
  mean_us: number;
  p50_us: number;
  p99_us: number;
  /** Mean compute time the build reported. */
  reportedCompute_mean_us: number;
  samples: number;
}

export interface ClosedLoopFigure extends TimingStats {
  /** Simulated time of one episode. */
  simulated_s: number;
  /** simulated_s ÷ mean episode wall time. */
  realTimeFactor: number;
  /** Set when the episode ended early (fall, build failure); the factor still divides what ran. */
  endedEarly?: string;
}

export interface BuildBench {
  name: string;
  spec: string;
  kind: string;
  /** Present for builds exposing `governorUpdate` (harness/builds/interface.ts). */
  governor?: RateFigure & { updatesPerSecond: number };
  tick: RateFigure;
  ticksPerSecond: number;
  closedLoop: ClosedLoopFigure;
  realTimeFactor: number;
  /** Process builds only. */
  protocolOverhead?: ProtocolOverhead;
  /** Observations recorded from the build's own run of the scenario and replayed to it. */
  recordedObservations: number;
}

export interface BenchFailure {
  name: string;
  spec: string;
  message: string;
}

export interface BenchReport {
  format: typeof BENCH_FORMAT;
  formatVersion: typeof BENCH_FORMAT_VERSION;
  toolVersion: string;
  startedAt: string;
  machine: MachineInfo;
  scenario: { id: string; file: string; hash: string; duration_s: number; controlRate_Hz: number };
  /** tinybench time budget per task, milliseconds. */
  time_ms: number;
  plant: PlantBench;
  builds: BuildBench[];
  /** Builds that could not be measured (open failed, errored run). */
  failures: BenchFailure[];
}

/** What a bench thread of its own (ownThread.ts) measures. */
export type OwnThreadTask =
  | { task: 'overhead'; scenario: ResolvedScenario; budget: TaskBudget }
  | { task: 'closedLoop'; scenario: ResolvedScenario; budget: TaskBudget; spec: BuildSpec };

export interface TaskBudget {
  /** tinybench `time` per task, milliseconds. */
  time_ms: number;
  /** tinybench minimum iterations per task. */
  iterations: number;
}
