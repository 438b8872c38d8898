// Total mechanical energy of a plant whose every force is conservative (no contact damping, no
// friction, no leg damping, no end-stop damping): used by the energy-conservation tests.

import { createAction, type Action } from '../../harness/builds/interface.js';
import type { Plant } from '../../harness/plant/plant.js';
import { matrixFromQuaternion } from '../../harness/plant/rotation.js';

export interface PlantState {
  trunkPosition_m: Float64Array;
  trunkQuaternion: Float64Array;
  trunkVelocity_mps: Float64Array;
  trunkAngularVelocity_radps: Float64Array;
  footPosition_m: Float64Array;
  footVelocity_mps: Float64Array;
}

function snapshot(plant: Plant): PlantState {
  return {
    trunkPosition_m: plant.trunkPosition_m.slice(),
    trunkQuaternion: plant.trunkQuaternion.slice(),
    trunkVelocity_mps: plant.trunkVelocity_mps.slice(),
    trunkAngularVelocity_radps: plant.trunkAngularVelocity_radps.slice(),
    footPosition_m: plant.footPosition_m.slice(),
    footVelocity_mps: plant.footVelocity_mps.slice(),
  };
}

/**
 * Steps the plant once and returns the energy at the configuration the step started from. The
 * leapfrog keeps velocities at half steps, so the velocity at that configuration is the mean of
 * the velocities before and after the step (second-order accurate, like the scheme itself).
 */
export function stepAndMeasure(plant: Plant, action: Action): number {
  const before = snapshot(plant);
  plant.step();
  const pairs: [Float64Array, Float64Array][] = [
    [before.trunkVelocity_mps, plant.trunkVelocity_mps],
    [before.trunkAngularVelocity_radps, plant.trunkAngularVelocity_radps],
    [before.footVelocity_mps, plant.footVelocity_mps],
  ];
  for (const [mid, after] of pairs) for (let j = 0; j < mid.length; j++) mid[j] = 0.5 * (mid[j] + after[j]);
  return totalEnergy(plant, action, before);
}

/** Elastic energy of k·δⁿ: ∫ k·δⁿ dδ = k·δⁿ⁺¹/(n + 1). */
function contactEnergy(k: number, n: number, depth: number): number {
  return depth > 0 ? (k * depth ** (n + 1)) / (n + 1) : 0;
}

/**
 * Kinetic + gravitational + contact + leg (impedance, constant feed-forward, end-stop) energy.
 * `action` is the held action (stiffness and feed-forward only; damping must be zero).
 */
export function totalEnergy(plant: Plant, action: Action, state: PlantState = plant): number {
  const robot = plant.robot;
  const { stiffness_N_per_m: k, exponent: n } = plant.contactLaw;
  const g = plant.gravity_mps2;
  const R = matrixFromQuaternion(new Float64Array(9), state.trunkQuaternion);
  const p = state.trunkPosition_m;
  const v = state.trunkVelocity_mps;
  const w = state.trunkAngularVelocity_radps;
  const I = robot.trunk.inertia_kgm2;
  const mt = robot.trunk.mass_kg;
  const mf = robot.foot.mass_kg;
  let E = 0.5 * mt * (v[0] ** 2 + v[1] ** 2 + v[2] ** 2);
  for (let r = 0; r < 3; r++) E += 0.5 * w[r] * (I[r][0] * w[0] + I[r][1] * w[1] + I[r][2] * w[2]);
  E -= mt * (g[0] * p[0] + g[1] * p[1] + g[2] * p[2]);
  // Trunk box corners on the ground.
  const he = robot.trunk.halfExtents_m;
  for (let c = 0; c < 8; c++) {
    const b = [c & 1 ? he[0] : -he[0], c & 2 ? he[1] : -he[1], c & 4 ? he[2] : -he[2]];
    const z = p[2] + R[6] * b[0] + R[7] * b[1] + R[8] * b[2];
    E += contactEnergy(k, n, -z);
  }
  const leg = robot.leg;
  for (let i = 0; i < plant.footCount; i++) {
    const a = 3 * i;
    const fp = state.footPosition_m.subarray(a, a + 3);
    const fv = state.footVelocity_mps.subarray(a, a + 3);
    E += 0.5 * mf * (fv[0] ** 2 + fv[1] ** 2 + fv[2] ** 2);
    E -= mf * (g[0] * fp[0] + g[1] * fp[1] + g[2] * fp[2]);
    E += contactEnergy(k, n, -fp[2]);
    const r = robot.hips_m[i];
    const hip = [0, 1, 2].map((row) => p[row] + R[3 * row] * r[0] + R[3 * row + 1] * r[1] + R[3 * row + 2] * r[2]);
    const rel = [fp[0] - hip[0], fp[1] - hip[1], fp[2] - hip[2]];
    // Constant world-frame feed-forward pair: potential f·(foot − hip).
    for (let j = 0; j < 3; j++) E += action.groundForce_N[a + j] * rel[j];
    // Impedance spring toward the target fixed in the trunk frame: ½·kp·|Rᵀ·rel − target|².
    const kp = action.stiffness_N_per_m[i];
    if (kp !== 0) {
      let s = 0;
      for (let j = 0; j < 3; j++) {
        const body = R[j] * rel[0] + R[3 + j] * rel[1] + R[6 + j] * rel[2];
        s += (body - action.footTarget_m[a + j]) ** 2;
      }
      E += 0.5 * kp * s;
    }
    const length = Math.hypot(rel[0], rel[1], rel[2]);
    if (length > leg.maxLength_m) E += 0.5 * leg.endStopStiffness_N_per_m * (length - leg.maxLength_m) ** 2;
    if (length < leg.minLength_m) E += 0.5 * leg.endStopStiffness_N_per_m * (leg.minLength_m - length) ** 2;
  }
  return E;
}

/** A lossless standing action: weight share feed-forward plus undamped leg springs. */
export function losslessHold(plant: Plant, stiffness_N_per_m: number): Action {
  const n = plant.footCount;
  const action = createAction(n, 0);
  const share = plant.robot.trunk.mass_kg / n;
  for (let i = 0; i < n; i++) {
    action.mode[i] = 1;
    for (let a = 0; a < 3; a++) action.groundForce_N[3 * i + a] = -share * plant.gravity_mps2[a];
    action.footTarget_m[3 * i + 2] = -plant.robot.standingHeight_m;
    action.stiffness_N_per_m[i] = stiffness_N_per_m;
  }
  return action;
}
