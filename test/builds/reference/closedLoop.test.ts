// Closed loop with the contact plant (harness/plant/plant.ts) on flat ground: the reference
// builds stand and trot without falling, and on a slippery floor (μs = 0.2, "a slippery floor" is
// common practice) the governed build slips far less than the nominal one after an abrupt
// velocity command. The scenario here is the test's own (test/support/robots.ts robot and ground).

import { describe, expect, it } from 'vitest';
import { createAction, createObservation } from '../../../harness/builds/interface.js';
import { referenceBuilds } from '../../../harness/builds/reference/index.js';
import { Plant } from '../../../harness/plant/plant.js';
import { material, plantConfig, testRobot } from '../../support/robots.js';

interface Outcome {
  minHeight_m: number;
  maxTilt_rad: number;
  distance_m: number;
  /** Σ over feet of the distance slid while in contact. */
  slip_m: number;
}

function run(id: string, mu: number, speed_mps: number, duration_s: number): Outcome {
  const robot = testRobot();
  const plant = new Plant(plantConfig({ robot, material: material({ staticFriction: mu, kineticFriction: 0.8 * mu }) }));
  const controller = referenceBuilds[id]({
    robot,
    controlRate_Hz: 1000,
    physicsStep_s: plant.step_s,
    gravity_mps2: [plant.gravity_mps2[0], plant.gravity_mps2[1], plant.gravity_mps2[2]],
    options: {},
  });
  if (controller instanceof Promise) throw new Error('reference builds are synchronous');
  const obs = createObservation(4);
  const action = createAction(4, controller.telemetryNames.length);
  const stepsPerTick = Math.round(0.001 / plant.step_s);
  const out: Outcome = { minHeight_m: Infinity, maxTilt_rad: 0, distance_m: 0, slip_m: 0 };
  for (let k = 0; k < duration_s * 1000; k++) {
    plant.fillObservation(obs);
    obs.frictionEstimate.fill(mu);
    const t = k / 1000;
    obs.command.gait = t >= 0.5 ? 'trot' : 'stand';
    obs.command.velocity_mps[0] = t >= 1 ? speed_mps : 0;
    controller.tick(obs, action);
    plant.applyAction(action);
    for (let s = 0; s < stepsPerTick; s++) {
      plant.step();
      for (let i = 0; i < 4; i++) {
        if (plant.footInContact[i]) out.slip_m += Math.hypot(plant.footVelocity_mps[3 * i], plant.footVelocity_mps[3 * i + 1]) * plant.step_s;
      }
    }
    const q = plant.trunkQuaternion;
    // Tilt of the trunk's z axis from vertical: sin(θ/2) = √(x² + y²) for a unit quaternion.
    out.maxTilt_rad = Math.max(out.maxTilt_rad, 2 * Math.asin(Math.min(1, Math.sqrt(q[1] * q[1] + q[2] * q[2]))));
    out.minHeight_m = Math.min(out.minHeight_m, plant.trunkPosition_m[2]);
  }
  out.distance_m = plant.trunkPosition_m[0];
  return out;
}

describe('reference builds in closed loop with the plant', () => {
  for (const id of ['nominal', 'governed', 'clamped', 'qp']) {
    it(`${id}: stands, then trots at 0.3 m/s on dry ground without falling`, () => {
      const out = run(id, 0.9, 0.3, 3);
      // Standing height 0.30 m; a fall would put the trunk box (half height 0.06 m) near the ground.
      expect(out.minHeight_m).toBeGreaterThan(0.25);
      expect(out.maxTilt_rad).toBeLessThan(0.1);
      // 2 s at 0.3 m/s = 0.6 m commanded; accept a lag of the PD and the governor's ramp.
      expect(out.distance_m).toBeGreaterThan(0.45);
      expect(out.distance_m).toBeLessThan(0.75);
    });
  }

  it('on μs = 0.2 after an abrupt 0.6 m/s command, governed slips at least 5× less than nominal', () => {
    const nominal = run('nominal', 0.2, 0.6, 3);
    const governed = run('governed', 0.2, 0.6, 3);
    expect(governed.slip_m * 5).toBeLessThan(nominal.slip_m);
    expect(governed.minHeight_m).toBeGreaterThan(0.25);
    // Measured when written: nominal ≈ 3 m of foot slip, governed ≈ 0.02 m.
    if (process.env.FOOTING_PRINT) console.log(JSON.stringify({ nominal, governed }));
  });
});
