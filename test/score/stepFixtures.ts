// Hand-made physics steps for the per-step scorer tests: a StepView the test writes in place (the
// shape the plant itself has), with the fixture robot of fixtures.ts standing on four feet.

import type { StepView } from '../../harness/score/sample.js';
import { FOOT_COUNT } from './fixtures.js';

export const STEP_s = 0.0005;

export interface MutableStep extends StepView {
  time_s: number;
  step_s: number;
  lastStep_s: number;
  stepWeight: number;
  trunkGroundForce_N: number;
}

/** Standing: each foot at rest with a quarter of the weight (32 N), no tangential force. */
export function standingStep(): MutableStep {
  const step: MutableStep = {
    time_s: 0,
    step_s: STEP_s,
    lastStep_s: STEP_s,
    stepWeight: 1,
    trunkPosition_m: new Float64Array([0, 0, 0.3]),
    trunkQuaternion: new Float64Array([1, 0, 0, 0]),
    trunkGroundForce_N: 0,
    footVelocity_mps: new Float64Array(3 * FOOT_COUNT),
    footGroundForce_N: new Float64Array(3 * FOOT_COUNT),
    footStaticFriction: new Float64Array(FOOT_COUNT).fill(0.5),
  };
  for (let i = 0; i < FOOT_COUNT; i++) step.footGroundForce_N[3 * i + 2] = 32;
  return step;
}

/** Sets foot i's ground force and velocity. */
export function setFoot(step: MutableStep, i: number, force_N: readonly number[], velocity_mps: readonly number[] = [0, 0, 0]): void {
  step.footGroundForce_N.set(force_N, 3 * i);
  step.footVelocity_mps.set(velocity_mps, 3 * i);
}
