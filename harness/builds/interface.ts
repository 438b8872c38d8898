// The contract between the harness and a controller build: the setup a build is given once, and
// the Controller it returns. The per-tick data (Observation, Action) is the tick contract in
// harness/contract/tick.ts, re-exported here so a build author reads one file.

import type { Action, Observation } from '../contract/tick.js';
import type { RobotParams, Vec3 } from '../plant/types.js';

export * from '../contract/tick.js';

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
   * nothing; process builds return nothing when the answer came during their answer spin, else a
   * promise that settles when it arrived.
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
