// Undamped cases must keep their mechanical energy: every force below has a potential (gravity,
// Hertz contact with c = 0, central leg springs, a constant feed-forward pair, end-stops) and
// nothing dissipates (frictionless floor, no damping anywhere). A scheme that is symplectic for
// the coupled translation and rotation keeps the energy error bounded, O(h²), with no drift
// (Hairer, Lubich & Wanner, Geometric Numerical Integration, ch. IX). 1 % over 20 s at the default
// step is the requirement.

import { describe, expect, it } from 'vitest';
import { createAction } from '../../harness/builds/interface.js';
import { DEFAULT_CONTACT, DEFAULT_PHYSICS_STEP_s } from '../../harness/plant/defaults.js';
import { Plant } from '../../harness/plant/plant.js';
import { limpAction, material, plantConfig, testRobot } from '../support/robots.js';
import { stepAndMeasure } from './energy.js';

const frictionless = material({ staticFriction: 0, kineticFriction: 0 });
const lossless = testRobot({
  leg: { minLength_m: 0.12, maxLength_m: 0.42, maxForce_N: 4000, endStopStiffness_N_per_m: 5e4, endStopDamping_Ns_per_m: 0 },
});
/** Limp legs whose end-stops are out of reach: the feet fly free of the trunk. */
const freeFeet = testRobot({
  leg: { minLength_m: 0, maxLength_m: 100, maxForce_N: 4000, endStopStiffness_N_per_m: 0, endStopDamping_Ns_per_m: 0 },
});
const soft = { ...DEFAULT_CONTACT, damping_s_per_m: 0 };
const stiff = { ...soft, stiffness_N_per_m: 100 * DEFAULT_CONTACT.stiffness_N_per_m };
const duration_s = 20;

/** Largest |E(t) − E(0)| over the run, sampled every 10 steps. */
function worstEnergyError_J(plant: Plant, action: ReturnType<typeof createAction>): { E0: number; worst: number } {
  plant.applyAction(action);
  const E0 = stepAndMeasure(plant, action);
  let worst = 0;
  const steps = Math.round(duration_s / plant.step_s);
  for (let k = 1; k < steps; k++) {
    if (k % 10 !== 0) plant.step();
    else worst = Math.max(worst, Math.abs(stepAndMeasure(plant, action) - E0));
  }
  return { E0, worst };
}

/**
 * Legs as central springs about the hip with a rest length: a spring of stiffness kp toward the hip
 * plus a feed-forward that sets the rest length and carries the trunk. Both have a potential in the
 * plant's leg model, which applies each leg's force at the hip (a spring toward a target offset from
 * the hip has none: DEVELOPERS.md, "The leg model is not fully conservative").
 */
function centralSprings(plant: Plant, stiffness_N_per_m: number) {
  const n = plant.footCount;
  const action = createAction(n, 0);
  const share = plant.robot.trunk.mass_kg / n;
  for (let i = 0; i < n; i++) {
    action.mode[i] = 1;
    for (let a = 0; a < 3; a++) action.groundForce_N[3 * i + a] = -share * plant.gravity_mps2[a];
    action.groundForce_N[3 * i + 2] += stiffness_N_per_m * plant.robot.standingHeight_m;
    action.stiffness_N_per_m[i] = stiffness_N_per_m;
  }
  return action;
}

describe('energy without damping over 20 s at the default step', () => {
  // The stiff contact runs at the step the scenario check asks for it (≤ 0.38 ms for this robot:
  // 10 steps per contact period, harness/plant/contactLaw.ts); the default at the default step.
  it.each([
    ['the default contact at 0.5 ms', soft, DEFAULT_PHYSICS_STEP_s],
    ['a 100× stiffer contact at 0.25 ms', stiff, DEFAULT_PHYSICS_STEP_s / 2],
  ])('a tumbling drop on a frictionless floor keeps its energy within 1 %, on %s', (_name, contact, step_s) => {
    // Dropped from 1 m spinning about all three axes (|ω| = 3.7 rad/s), limp legs with the end-stops
    // out of reach: the feet and the trunk's corners hit the floor again and again.
    const high = 0.7;
    const plant = new Plant(
      plantConfig({
        robot: freeFeet, material: frictionless, contact, step_s,
        position_m: [0, 0, 1], angularVelocity_radps: [2, 3, 1],
        feet: [[0.25, 0.12, high], [0.25, -0.12, high], [-0.25, 0.12, high], [-0.25, -0.12, high]],
      }),
    );
    const { E0, worst } = worstEnergyError_J(plant, limpAction(plant));
    expect(plant.time_s).toBeCloseTo(duration_s, 9); // no divergence
    expect(worst / E0).toBeLessThan(0.01); // energy above the floor's level (potential zero at z = 0)
  });

  it.each([
    ['the default contact', soft],
    ['a 100× stiffer contact', stiff],
  ])('rocking on lossless leg springs keeps its energy within 1 % of the motion’s energy, on %s', (_name, contact) => {
    // Settled start, then a roll–pitch–yaw spin: the trunk rocks on four undamped leg springs.
    const plant = new Plant(plantConfig({ robot: lossless, material: frictionless, contact, step_s: DEFAULT_PHYSICS_STEP_s }));
    plant.trunkAngularVelocity_radps.set([1.5, 1.0, 0.5]);
    const I = lossless.trunk.inertia_kgm2;
    const w = plant.trunkAngularVelocity_radps;
    let motion_J = 0;
    for (let r = 0; r < 3; r++) motion_J += 0.5 * w[r] * (I[r][0] * w[0] + I[r][1] * w[1] + I[r][2] * w[2]);
    const { worst } = worstEnergyError_J(plant, centralSprings(plant, 3000));
    expect(plant.time_s).toBeCloseTo(duration_s, 9);
    expect(worst / motion_J).toBeLessThan(0.01);
  });
});
