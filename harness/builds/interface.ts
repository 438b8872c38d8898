// The contract between the harness and a controller build. Observation and Action are allocated
// once per run (createObservation / createAction) and mutated in place every control tick, so a
// tick allocates nothing. All vectors are flat Float64Arrays; foot i occupies [3i, 3i+3).

import type { RobotParams, Vec3 } from '../plant/types.js';

export type GaitName = 'stand' | 'trot';
export const GAIT_NAMES: readonly GaitName[] = ['stand', 'trot'];

/** What the operator asks for right now (the controller's target motion). */
export interface Command {
  gait: GaitName;
  /** Wanted trunk velocity, world frame (x, y; z ignored by the reference builds). */
  velocity_mps: Float64Array;
  yawRate_radps: number;
}

export interface Observation {
  time_s: number;
  trunkPosition_m: Float64Array; // 3, world
  trunkQuaternion: Float64Array; // 4, (w, x, y, z), trunk → world
  trunkVelocity_mps: Float64Array; // 3, world
  trunkAngularVelocity_radps: Float64Array; // 3, trunk (body) frame
  footPosition_m: Float64Array; // 3N, world
  footVelocity_mps: Float64Array; // 3N, world
  /** Measured ground force on each foot, world frame, with the scenario's sensor noise. */
  footForce_N: Float64Array; // 3N
  /** 1 when the foot touches the ground. */
  footContact: Uint8Array; // N
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

/** Given once at the start of a run. */
export interface ControllerSetup {
  robot: RobotParams;
  controlRate_Hz: number;
  physicsStep_s: number;
  /** Gravity in the world frame (the ground is z = 0; an incline tilts gravity). */
  gravity_mps2: Vec3;
  /** Free-form options from the build spec. */
  options: Record<string, unknown>;
}

export interface Controller {
  /** Names of the telemetry scalars this build writes; fixed for the run. */
  readonly telemetryNames: readonly string[];
  /**
   * Reads obs, writes every field of action. Must not allocate. In-process builds return
   * nothing; process builds return a promise that settles when the build's answer arrived.
   */
  tick(obs: Observation, action: Action): void | Promise<void>;
  /**
   * Optional: one governor update alone, for the bench. Fed a recorded observation; advances the
   * governor's applied reference by one control period.
   */
  governorUpdate?(obs: Observation): void;
  close?(): void | Promise<void>;
}

/** An in-process build module exports this as `createController` (or default). */
export type ControllerFactory = (setup: ControllerSetup) => Controller | Promise<Controller>;

export function createObservation(footCount: number): Observation {
  return {
    time_s: 0,
    trunkPosition_m: new Float64Array(3),
    trunkQuaternion: new Float64Array([1, 0, 0, 0]),
    trunkVelocity_mps: new Float64Array(3),
    trunkAngularVelocity_radps: new Float64Array(3),
    footPosition_m: new Float64Array(3 * footCount),
    footVelocity_mps: new Float64Array(3 * footCount),
    footForce_N: new Float64Array(3 * footCount),
    footContact: new Uint8Array(footCount),
    frictionEstimate: new Float64Array(footCount),
    command: { gait: 'stand', velocity_mps: new Float64Array(3), yawRate_radps: 0 },
  };
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
  into.time_s = from.time_s;
  into.trunkPosition_m.set(from.trunkPosition_m);
  into.trunkQuaternion.set(from.trunkQuaternion);
  into.trunkVelocity_mps.set(from.trunkVelocity_mps);
  into.trunkAngularVelocity_radps.set(from.trunkAngularVelocity_radps);
  into.footPosition_m.set(from.footPosition_m);
  into.footVelocity_mps.set(from.footVelocity_mps);
  into.footForce_N.set(from.footForce_N);
  into.footContact.set(from.footContact);
  into.frictionEstimate.set(from.frictionEstimate);
  into.command.gait = from.command.gait;
  into.command.velocity_mps.set(from.command.velocity_mps);
  into.command.yawRate_radps = from.command.yawRate_radps;
}
