// Shared by the build-infrastructure tests: an invented four-legged test robot, a setup for it,
// synthetic observations, and a check that a process is really gone.

import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { createAction, createObservation, type Action, type ControllerSetup, type Observation } from '../../../harness/builds/interface.js';
import type { OpenedBuild } from '../../../harness/builds/loader.js';
import type { RobotParams } from '../../../harness/plant/types.js';

export const FIXTURES = fileURLToPath(new URL('./fixtures/', import.meta.url));
export const REPO_ROOT = fileURLToPath(new URL('../../../', import.meta.url));

/** A made-up 12 kg quadruped; the numbers are plausible, not taken from any machine. */
export const TEST_ROBOT: RobotParams = {
  id: 'test-quad',
  name: 'Test quadruped',
  trunk: {
    mass_kg: 12,
    inertia_kgm2: [
      [0.07, 0, 0],
      [0, 0.26, 0],
      [0, 0, 0.28],
    ],
    halfExtents_m: [0.3, 0.1, 0.06],
  },
  hips_m: [
    [0.2, 0.1, -0.03],
    [0.2, -0.1, -0.03],
    [-0.2, 0.1, -0.03],
    [-0.2, -0.1, -0.03],
  ],
  foot: { mass_kg: 0.25 },
  leg: {
    minLength_m: 0.1,
    maxLength_m: 0.4,
    maxForce_N: 200,
    endStopStiffness_N_per_m: 5e4,
    endStopDamping_Ns_per_m: 200,
  },
  standingHeight_m: 0.3,
  gait: { period_s: 0.4, dutyFactor: 0.6, swingApex_m: 0.06 },
};

export function testSetup(options: Record<string, unknown> = {}): ControllerSetup {
  return {
    robot: TEST_ROBOT,
    controlRate_Hz: 1000,
    physicsStep_s: 0.0005,
    gravity_mps2: [0, 0, -9.80665],
    options,
  };
}

/**
 * Deterministic synthetic observations near standing: small tilts, offsets and velocities from a
 * fixed-seed generator (not physics; only the controllers' arithmetic is under test).
 */
export function syntheticObservation(obs: Observation, step: number): void {
  let state = (0x9e3779b9 ^ Math.imul(step + 1, 0x85ebca6b)) >>> 0;
  const next = (): number => {
    // xorshift32 (Marsaglia 2003): enough to vary inputs reproducibly.
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return state / 4294967296 - 0.5;
  };
  obs.time_s = step * 0.001;
  obs.trunkPosition_m.set([0.01 * next(), 0.01 * next(), 0.3 + 0.02 * next()]);
  const half = [0.05 * next(), 0.05 * next(), 0.05 * next()];
  const w = Math.sqrt(1 - half[0] ** 2 - half[1] ** 2 - half[2] ** 2);
  obs.trunkQuaternion.set([w, half[0], half[1], half[2]]);
  obs.trunkVelocity_mps.set([0.1 * next(), 0.1 * next(), 0.1 * next()]);
  obs.trunkAngularVelocity_radps.set([0.5 * next(), 0.5 * next(), 0.5 * next()]);
  for (let i = 0; i < TEST_ROBOT.hips_m.length; i++) {
    const hip = TEST_ROBOT.hips_m[i];
    obs.footPosition_m.set([hip[0] + 0.01 * next(), hip[1] + 0.01 * next(), 0.002 * next()], 3 * i);
    obs.footVelocity_mps.set([0.01 * next(), 0.01 * next(), 0.01 * next()], 3 * i);
    obs.footForce_N.set([next(), next(), 30 + 5 * next()], 3 * i);
    obs.footContact[i] = next() > -0.4 ? 1 : 0;
    obs.frictionEstimate[i] = 0.6 + 0.1 * next();
  }
  if (step % 7 === 0) obs.trunkVelocity_mps[1] = -0; // the sign of zero must survive the wire
}

export function newObservation(): Observation {
  return createObservation(TEST_ROBOT.hips_m.length);
}

/** The build's answers to `ticks` synthetic observations, each into an action of its own. */
export async function syntheticActions(build: OpenedBuild, ticks: number): Promise<Action[]> {
  const obs = newObservation();
  const actions: Action[] = [];
  for (let k = 0; k < ticks; k++) {
    syntheticObservation(obs, k);
    const action = createAction(TEST_ROBOT.hips_m.length, build.telemetryNames.length);
    const pending = build.tick(obs, action);
    if (pending !== undefined) await pending;
    actions.push(action);
  }
  return actions;
}

/** True while `pid` is a live process; a zombie (exited, not yet reaped) counts as gone. */
export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch {
    return false;
  }
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Field 3, after the parenthesised command name, is the state letter.
    return stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3) !== 'Z';
  } catch {
    return false;
  }
}

/** Polls until `pid` is gone or `limit_ms` passes (a killed grandchild is reaped by init). */
export async function waitGone(pid: number, limit_ms = 2000): Promise<boolean> {
  const until = Date.now() + limit_ms;
  while (isAlive(pid)) {
    if (Date.now() > until) return false;
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
  return true;
}
