// The gate's loop-time measurement for one build pair over a suite's scenarios: record what the
// baseline build observes in (the start of) each scenario, open both builds on each scenario, and
// time them in interleaved rounds on those same observations (pairedTiming.ts).

import { unpackObservations, type PackedObservations } from '../contract/packed.js';
import { createAction, type Observation } from '../contract/tick.js';
import { openBuild, type OpenBuildOptions, type OpenedBuild } from '../builds/loader.js';
import type { BuildSpec } from '../builds/spec.js';
import { controllerSetup } from '../run/runOne.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { recordingPlan, recordObservations } from './measure.js';
import type { ObservationRequest } from '../run/observed.js';
import { DEFAULT_PAIRED_TIMING, timePaired, type PairedStream, type PairedTiming, type PairedTimingOptions } from './pairedTiming.js';

/**
 * Simulated time recorded per scenario: a stand, a start and some trotting for the bundled walks,
 * at a fraction of a full run's cost (common practice: enough states to exercise every branch of
 * a tick, not the whole episode).
 */
export const RECORDED_DURATION_s = 3;

/** Most scenarios timed per build pair; more are sampled evenly (the rounds take turns anyway). */
export const MAX_TIMED_SCENARIOS = 12;

export interface PairedLoopTimeOptions extends Partial<PairedTimingOptions> {
  openOptions?: OpenBuildOptions;
}

function evenly<T>(items: readonly T[], count: number): T[] {
  if (items.length <= count) return [...items];
  return Array.from({ length: count }, (_, k) => items[Math.floor((k * items.length) / count)]);
}

/** What the baseline build observed in the start of one scenario. */
export interface RecordedStream {
  scenario: ResolvedScenario;
  observations: Observation[];
}

/** The scenarios the loop time is timed on. */
export function timedScenarios(scenarios: readonly ResolvedScenario[]): ResolvedScenario[] {
  return evenly(scenarios.filter((s) => !s.family), MAX_TIMED_SCENARIOS);
}

function recorded(scenario: ResolvedScenario): ResolvedScenario {
  return { ...scenario, duration_s: Math.min(scenario.duration_s, RECORDED_DURATION_s) };
}

/**
 * What a suite run of `scenario` keeps for the timing: the ticks a recording run of its first
 * RECORDED_DURATION_s would (the episode is the same from the same start until then).
 */
export function observationRequest(scenario: ResolvedScenario): ObservationRequest {
  return recordingPlan(recorded(scenario));
}

/**
 * Records the baseline build's observations once; every candidate is then timed on them.
 * `observed`: what the suite's own baseline runs kept (observationRequest), by scenario id; a
 * scenario without it (resumed, or its run failed) is recorded here.
 */
export async function recordStreams(
  scenarios: readonly ResolvedScenario[],
  baseline: BuildSpec,
  openOptions: OpenBuildOptions = {},
  observed: ReadonlyMap<string, PackedObservations> = new Map(),
): Promise<RecordedStream[]> {
  const chosen = timedScenarios(scenarios);
  if (chosen.length === 0) throw new RangeError('paired loop time: no scenario to record observations from');
  const streams: RecordedStream[] = [];
  for (const scenario of chosen) {
    const kept = observed.get(scenario.id);
    if (kept && kept.count > 0) {
      streams.push({ scenario, observations: unpackObservations(kept) });
      continue;
    }
    const ring = await recordObservations(recorded(scenario), baseline, openOptions);
    streams.push({ scenario, observations: ring.entries.slice(0, ring.size) });
  }
  return streams;
}

export async function measurePairedLoopTime(
  recordings: readonly RecordedStream[],
  baseline: BuildSpec,
  candidate: BuildSpec,
  options: PairedLoopTimeOptions = {},
): Promise<PairedTiming> {
  const timing: PairedTimingOptions = { ...DEFAULT_PAIRED_TIMING, ...options };
  // No answer spin (unless asked): whether a spin engages depends on the machine's load (its
  // back-off) and would differ between the two sides, so the ratio would measure the machine.
  const openOptions: OpenBuildOptions = { spin_us: 0, ...options.openOptions };
  const opened: OpenedBuild[] = [];
  try {
    const streams: PairedStream[] = [];
    for (const { scenario, observations } of recordings) {
      const setup = controllerSetup(scenario);
      const base = await openBuild(baseline, setup, openOptions);
      opened.push(base);
      const cand = await openBuild(candidate, setup, openOptions);
      opened.push(cand);
      const footCount = scenario.plant.robot.hips_m.length;
      streams.push({
        scenario: scenario.id,
        budget_us: scenario.control.loopBudget_us,
        observations,
        baseline: base,
        candidate: cand,
        baselineAction: createAction(footCount, base.telemetryNames.length),
        candidateAction: createAction(footCount, cand.telemetryNames.length),
      });
    }
    return await timePaired(streams, timing);
  } finally {
    await Promise.allSettled(opened.map((b) => b.close()));
  }
}
