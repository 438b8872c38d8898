// The tick contract: what the harness gives a controller every control tick (Observation) and what
// it gets back (Action), with gait names and leg modes. It sits below the plant and the builds, so
// both import it and neither imports the other. Observation and Action are allocated once per run
// (createObservation / createAction) and mutated in place every tick, so a tick allocates nothing.
// All vectors are flat Float64Arrays; foot i occupies [3i, 3i+3).

import { copyRobotState, createRobotState, type RobotState } from './state.js';

export type GaitName = 'stand' | 'trot';
export const GAIT_NAMES: readonly GaitName[] = ['stand', 'trot'];

/** What the operator asks for right now (the controller's target motion). */
export interface Command {
  gait: GaitName;
  /** Wanted trunk velocity, world frame (x, y; z ignored by the reference builds). */
  velocity_mps: Float64Array;
  yawRate_radps: number;
}

/** The robot's state as measured (footForce_N carries the scenario's sensor noise), and what to do. */
export interface Observation extends RobotState {
  /** Static friction the controller is told for the ground under each foot (scenario `sensing`). */
  frictionEstimate: Float64Array; // N
  command: Command;
}

export const STANCE = 1;
export const SWING = 0;

export interface Action {
  /** Per leg: STANCE (1) or SWING (0). */
  mode: Uint8Array; // N
  /** Wanted ground reaction force on each foot, world frame (the leg applies its negative). */
  groundForce_N: Float64Array; // 3N
  /** Foot target relative to the hip, trunk frame. */
  footTarget_m: Float64Array; // 3N
  footTargetVelocity_mps: Float64Array; // 3N
  /** Impedance gains per leg (isotropic, trunk frame). */
  stiffness_N_per_m: Float64Array; // N
  damping_Ns_per_m: Float64Array; // N
  /**
   * Named scalars the build wants recorded, in the order of Controller.telemetryNames. Names
   * starting with `governor.target.` / `governor.applied.` are the governor's target and applied
   * reference and are plotted together by the report.
   */
  telemetry: Float64Array;
}

export function createObservation(footCount: number): Observation {
  // Fields added to the state object, not spread into a new literal: every spread copy got a map
  // of its own, so each run's first ticks deoptimised the loop's code and left it polymorphic
  // (measured: a standing episode 2.6 → 4–6 µs per tick from the ninth run on, docs/bench.md).
  const obs = createRobotState(footCount) as Observation;
  obs.frictionEstimate = new Float64Array(footCount);
  obs.command = { gait: 'stand', velocity_mps: new Float64Array(3), yawRate_radps: 0 };
  return obs;
}

export function createAction(footCount: number, telemetryCount: number): Action {
  return {
    mode: new Uint8Array(footCount),
    groundForce_N: new Float64Array(3 * footCount),
    footTarget_m: new Float64Array(3 * footCount),
    footTargetVelocity_mps: new Float64Array(3 * footCount),
    stiffness_N_per_m: new Float64Array(footCount),
    damping_Ns_per_m: new Float64Array(footCount),
    telemetry: new Float64Array(telemetryCount),
  };
}

/** Copies every field of an observation into another of the same foot count (no allocation). */
export function copyObservation(into: Observation, from: Observation): void {
  copyRobotState(into, from);
  into.frictionEstimate.set(from.frictionEstimate);
  into.command.gait = from.command.gait;
  into.command.velocity_mps.set(from.command.velocity_mps);
  into.command.yawRate_radps = from.command.yawRate_radps;
}
