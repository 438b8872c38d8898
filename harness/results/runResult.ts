// Building results: a scored run becomes a RunResult through the scenario's acceptance checks; an
// error run keeps whatever was scored before it broke off.

import { availableParallelism, cpus } from 'node:os';
import type { ResolvedScenario } from '../scenario/types.js';
import { summarizeFamilies } from './familySummary.js';
import { lowestStaticFriction } from './slippery.js';
import { evaluateAcceptance } from '../score/acceptance.js';
import type { RunMetrics } from '../score/types.js';
import {
  RESULTS_FORMAT,
  RESULTS_FORMAT_VERSION,
  type BuildManifest,
  type MachineInfo,
  type ResultsFile,
  type RunError,
  type RunResult,
  type ScenarioRef,
  type TelemetryRange,
} from './types.js';

export function scenarioRef(scenario: ResolvedScenario): ScenarioRef {
  const ref: ScenarioRef = {
    id: scenario.id,
    revision: scenario.revision,
    hash: scenario.hash,
    file: scenario.file,
    title: scenario.title,
    start: scenario.plant.initial.start,
    lowestStaticFriction: lowestStaticFriction(scenario.plant.ground.friction),
  };
  if (scenario.family) ref.family = scenario.family;
  return ref;
}

/** What a run adds besides its score: its trace path and its telemetry extremes. */
export interface RunResultOptions {
  trace?: string;
  telemetry?: TelemetryRange[];
}

export function createRunResult(
  scenario: ResolvedScenario,
  build: string,
  scored: RunMetrics,
  options: RunResultOptions = {},
): RunResult {
  const { status, reasons } = evaluateAcceptance(scenario.acceptance, scored.metrics);
  const result: RunResult = { scenario: scenarioRef(scenario), build, status, reasons, sim: scored.sim, metrics: scored.metrics };
  if (options.trace !== undefined) result.trace = options.trace;
  if (options.telemetry !== undefined) result.telemetry = options.telemetry;
  return result;
}

export function createErrorRunResult(
  scenario: ResolvedScenario,
  build: string,
  error: RunError,
  scored: RunMetrics | null = null,
  options: RunResultOptions = {},
): RunResult {
  const at = error.time_s === undefined ? '' : ` at ${error.time_s.toFixed(3)} s`;
  const result: RunResult = {
    scenario: scenarioRef(scenario),
    build,
    status: 'error',
    reasons: [`error${at}: ${error.message}`],
    error,
    sim: scored?.sim ?? null,
    metrics: scored?.metrics ?? null,
  };
  if (options.trace !== undefined) result.trace = options.trace;
  if (options.telemetry !== undefined) result.telemetry = options.telemetry;
  return result;
}

export function describeMachine(): MachineInfo {
  const cpuList = cpus();
  return {
    cores: availableParallelism(),
    nodeVersion: process.version,
    platform: process.platform,
    arch: process.arch,
    cpuModel: cpuList.length > 0 ? cpuList[0].model.trim() : 'unknown',
  };
}

export function createResultsFile(header: {
  toolVersion: string;
  builds: BuildManifest[];
  startedAt?: Date | string;
  machine?: MachineInfo;
  runs?: RunResult[];
}): ResultsFile {
  const startedAt = header.startedAt ?? new Date();
  const runs = header.runs ?? [];
  const results: ResultsFile = {
    format: RESULTS_FORMAT,
    formatVersion: RESULTS_FORMAT_VERSION,
    toolVersion: header.toolVersion,
    startedAt: typeof startedAt === 'string' ? startedAt : startedAt.toISOString(),
    machine: header.machine ?? describeMachine(),
    builds: header.builds,
    runs,
  };
  // Family scores are derived from the runs held, so a shard or a merge summarises what it has.
  const families = summarizeFamilies(runs);
  if (families.length > 0) results.families = families;
  return results;
}

/** A run's first reason (acceptance sentence or error message), for one-line summaries. */
export function firstReason(run: Pick<RunResult, 'status' | 'reasons' | 'error'>): string {
  if (run.status === 'error') return `errored: ${run.error?.message ?? run.reasons[0] ?? 'no reason given'}`;
  return run.reasons[0] ?? run.status;
}
