// What the scorer sees. Per physics step, a StepView: the plant's own arrays after the step (the
// plant satisfies the interface itself, so nothing is copied per step). Per control tick, a
// TickSample: the plant's truth after the tick's physics steps, the action the build returned for
// it (held over the tick's steps), and the tick's measured wall time. The episode loop owns one
// TickSample per run whose state arrays are the plant's own (read in place, like a StepView) and
// overwrites its scalars every tick (no allocation); scorers copy what they keep.

import { createRobotState, type RobotState } from '../contract/state.js';
import type { Action } from '../contract/tick.js';

/** The robot's true state (footForce_N without sensor noise) and what the tick did with it. */
export interface TickSample extends RobotState {
  /** Control period, the weight of this sample in time integrals. */
  dt_s: number;
  /** True local static friction under each foot. */
  footStaticFriction: Float64Array; // N
  /** The build's action for this tick. */
  mode: Uint8Array; // N, STANCE = 1
  wantedForce_N: Float64Array; // 3N, world
  /** Normal force of the ground on the trunk's collision box (0 when clear). */
  trunkGroundForce_N: number;
  /** Commanded trunk position reference (integral of the commanded velocity), world. */
  referencePosition_m: Float64Array; // 3
  /** Wall time of the build's tick (in-process) or round trip (process build), microseconds. */
  loopTime_us: number;
  /** The build's own reported compute time for process builds, else NaN. */
  reportedCompute_us: number;
}

export function createTickSample(footCount: number): TickSample {
  // Added to the state object, not spread into a literal (one map for every run: createObservation).
  const sample = createRobotState(footCount) as TickSample;
  sample.dt_s = 0;
  sample.footStaticFriction = new Float64Array(footCount);
  sample.mode = new Uint8Array(footCount);
  sample.wantedForce_N = new Float64Array(3 * footCount);
  sample.trunkGroundForce_N = 0;
  sample.referencePosition_m = new Float64Array(3);
  sample.loopTime_us = 0;
  sample.reportedCompute_us = Number.NaN;
  return sample;
}

/**
 * The plant's truth after one physics step or landing substep, read in place
 * (harness/plant/plant.ts has these fields). Forces are those of the step, velocities the
 * post-kick ones; `lastStep_s` is the (sub)step's length, its weight in time integrals, and
 * `stepWeight` its share of a physics step, its weight in percentiles (1, or 1/K inside a landing
 * step cut into K substeps), so that no score depends on the substep count.
 */
export interface StepView {
  readonly time_s: number;
  /** The physics step (the scenario's). */
  readonly step_s: number;
  readonly lastStep_s: number;
  readonly stepWeight: number;
  readonly trunkPosition_m: Float64Array; // 3
  readonly trunkQuaternion: Float64Array; // 4, (w, x, y, z)
  readonly trunkGroundForce_N: number;
  readonly footVelocity_mps: Float64Array; // 3N
  readonly footGroundForce_N: Float64Array; // 3N, ground on foot, world
  readonly footStaticFriction: Float64Array; // N
}

/** The action held over a tick's physics steps (a TickSample carries it). */
export interface HeldAction {
  readonly mode: Uint8Array; // N, STANCE = 1
  readonly wantedForce_N: Float64Array; // 3N, world
}

/** What an observer learns once, before the first tick. */
export interface EpisodeStart {
  footCount: number;
  /** The build's telemetry names, in the order of Action.telemetry. */
  telemetryNames: readonly string[];
  /** The scorer's loaded threshold (Scorer.loadedThreshold_N). */
  loadedThreshold_N: number;
}

/** Something that watches every tick (trace writer, plot-series recorder). Must not keep `sample`. */
export interface TickObserver {
  /** Optional: called once before the first tick. */
  onStart?(info: EpisodeStart): void;
  onTick(sample: TickSample, action: Action): void;
}
