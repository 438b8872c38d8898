// The result set of `footing run`: one RunResult per (scenario × build), under a header naming the
// tool, machine and builds. JSON Schema: results.schema.json (validate.ts). Bump
// RESULTS_FORMAT_VERSION on any incompatible change.

import type { PairedLoopTimeRecord } from './loopTime.js';
import type { FamilySummary, RunMargin } from './margin.js';
import type { StartMode } from '../plant/types.js';
import type { FamilyMembership } from '../scenario/types.js';
import type { ScoreMetrics, SimMetrics } from '../score/types.js';
import type { FidelityBlock } from '../score/fidelity.js';

export const RESULTS_FORMAT = 'footing-results';

export interface ShardRecord {
  /** 1-based shard index K of `--shard K/N`. */
  index: number;
  /** N. */
  count: number;
  /** sha256 over every (scenario id, scenario hash, build) pair of the unsharded suite. */
  suite: string;
  /** Pairs of the unsharded suite. */
  pairs: number;
}
/** 2 added the optional run `margin`, scenario `family` and top-level `families` (migrate.ts reads 1). */
export const RESULTS_FORMAT_VERSION = 2;
export const RESULTS_FILE_NAME = 'results.json';

export interface ScenarioRef {
  id: string;
  revision: number;
  hash: string;
  file: string;
  title: string;
  /** Present when the scenario is one sample of a seeded family. */
  family?: FamilyMembership;
  /** How the run began (the resolved scenario's plant.initial.start). */
  start?: StartMode;
  /**
   * The lowest static friction coefficient over the floor, its patches and raster cells
   * (results/slippery.ts). Optional: results written before it existed lack it.
   */
  lowestStaticFriction?: number;
}

export type RunStatus = 'pass' | 'fail' | 'error';

export interface RunError {
  message: string;
  /** Simulated time at which the run broke off. */
  time_s?: number;
  /** A short machine-readable cause, e.g. 'timeout', 'crash', 'protocol', 'nonFinite'. */
  reason?: string;
  /** Last lines of a process build's stderr. */
  stderrTail?: string;
}

export interface RunResult {
  scenario: ScenarioRef;
  /** The build's name (BuildManifest.name). */
  build: string;
  status: RunStatus;
  /** Human sentences, one per broken acceptance check (or the error message). */
  reasons: string[];
  error?: RunError;
  /**
   * Null only for an error run that produced no ticks. `realTimeFactor` is the whole run's (cold:
   * it includes the JIT's warm-up); `steadyRealTimeFactor` the later half's (run/steadyClock.ts).
   */
  sim: (SimMetrics & { steadyRealTimeFactor?: number | null }) | null;
  metrics: ScoreMetrics | null;
  /** Trace CSV path relative to the results folder, with --trace. */
  trace?: string;
  /** footing replay only: the comparison with the scenario's recorded trajectory. */
  fidelity?: FidelityBlock;
  /**
   * The run's extremes of every telemetry scalar the build names (Controller.telemetryNames), in
   * that order; null when no tick recorded it. Absent for runs that never opened their build.
   */
  telemetry?: TelemetryRange[];
  /** Critical friction and push scales, written by `footing margin` (docs/margin.md). */
  margin?: RunMargin;
}

export interface TelemetryRange {
  name: string;
  min: number | null;
  max: number | null;
}

/** Kept loose on purpose: the build layer owns the fields beyond `name`. */
export interface BuildManifest {
  name: string;
  kind?: string;
  entry?: string;
  commit?: string | null;
  dirty?: boolean | null;
  [field: string]: unknown;
}

export interface MachineInfo {
  cores: number;
  nodeVersion: string;
  platform: string;
  arch: string;
  cpuModel: string;
}

export interface ResultsFile {
  format: typeof RESULTS_FORMAT;
  formatVersion: typeof RESULTS_FORMAT_VERSION;
  toolVersion: string;
  /** ISO 8601 start time of the run. */
  startedAt: string;
  machine: MachineInfo;
  builds: BuildManifest[];
  runs: RunResult[];
  /** One summary per (family, build) when the runs include family samples. */
  families?: FamilySummary[];
  /**
   * Optional bench figures (`footing run --bench`, harness/bench/attach.ts), in the shape of
   * harness/bench/bench.schema.json. Typed loosely here: the results layer does not import the bench.
   */
  bench?: { format: 'footing-bench'; formatVersion: number; builds: unknown[]; [field: string]: unknown };
  /**
   * Set by `footing run --shard K/N`: which share this is, and the identity of the whole suite it
   * was cut from, so `footing merge` can refuse missing, duplicate or mixed shards.
   */
  shard?: ShardRecord;
  /** Paired loop-time measurements of the gate's build pairs (`footing run --baseline`). */
  loopTime?: PairedLoopTimeRecord[];
}
