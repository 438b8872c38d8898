// The settled start: a robot that begins at rest in static equilibrium, feet preloaded to their
// share of the weight, sticking. The checks are statics (Newton's first law, force and moment
// balance) and the block on an incline (Halliday, Resnick & Walker, Fundamentals of Physics,
// friction chapter: a block at rest stays at rest while tan θ ≤ μs).

import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY_mps2 } from '../../harness/plant/defaults.js';
import { Plant } from '../../harness/plant/plant.js';
import { staticSupportForces } from '../../harness/plant/settle.js';
import { holdPosture, material, plantConfig, runFor } from '../support/robots.js';

const g = STANDARD_GRAVITY_mps2;

function footTravel_m(plant: Plant, start: Float64Array): number {
  let worst = 0;
  for (let i = 0; i < plant.footCount; i++) {
    worst = Math.max(worst, Math.hypot(plant.footPosition_m[3 * i] - start[3 * i], plant.footPosition_m[3 * i + 1] - start[3 * i + 1]));
  }
  return worst;
}

describe('static foot loads', () => {
  it('balance the weight and its moment about the centre of mass to rounding', () => {
    const feet = Float64Array.from([0.25, 0.12, 0, 0.25, -0.12, 0, -0.25, 0.12, 0, -0.3, -0.1, 0]);
    const centre = [0.02, -0.01, 0.3];
    const weight = [-20, 5, -200];
    const f = staticSupportForces(feet, centre, weight);
    const sum = [0, 0, 0];
    const moment = [0, 0, 0];
    for (let i = 0; i < 4; i++) {
      const r = [0, 1, 2].map((a) => feet[3 * i + a] - centre[a]);
      const fi = [f[3 * i], f[3 * i + 1], f[3 * i + 2]];
      for (let a = 0; a < 3; a++) sum[a] += fi[a];
      moment[0] += r[1] * fi[2] - r[2] * fi[1];
      moment[1] += r[2] * fi[0] - r[0] * fi[2];
      moment[2] += r[0] * fi[1] - r[1] * fi[0];
    }
    for (let a = 0; a < 3; a++) expect(Math.abs(sum[a] + weight[a])).toBeLessThan(1e-6);
    for (let a = 0; a < 3; a++) expect(Math.abs(moment[a])).toBeLessThan(1e-6);
  });
});

describe('a settled start', () => {
  it('shows every foot loaded at t = 0, the loads summing to the whole weight', () => {
    const plant = new Plant(plantConfig());
    let sum = 0;
    for (let i = 0; i < 4; i++) {
      expect(plant.footInContact[i]).toBe(1);
      expect(plant.footPosition_m[3 * i + 2]).toBeLessThan(0); // pressed in
      sum += plant.footGroundForce_N[3 * i + 2];
    }
    expect(Math.abs(sum - plant.totalMass_kg * g) / (plant.totalMass_kg * g)).toBeLessThan(1e-9);
  });

  it('keeps the standing robot still: the trunk moves < 0.5 mm in the first 0.5 s (a released start drops several mm)', () => {
    const settled = new Plant(plantConfig());
    const released = new Plant(plantConfig({ start: 'released' }));
    const z0 = settled.trunkPosition_m[2];
    let settledMove = 0;
    let releasedMove = 0;
    settled.applyAction(holdPosture(settled));
    released.applyAction(holdPosture(released));
    runFor(settled, 0.5, () => {
      settledMove = Math.max(settledMove, Math.abs(settled.trunkPosition_m[2] - z0));
    });
    runFor(released, 0.5, () => {
      releasedMove = Math.max(releasedMove, Math.abs(released.trunkPosition_m[2] - z0));
    });
    expect(settledMove).toBeLessThan(5e-4);
    expect(releasedMove).toBeGreaterThan(2e-3); // the contact spring's own sag under the load
  });

  it('holds on a ramp with μk < tan θ < μs: feet travel < 0.1 mm in 2 s, where a released start breaks stiction at t = 0', () => {
    // 14°: tan θ = 0.249 between μk 0.2 and μs 0.3. Statics says the robot holds. Released, the
    // feet carry the tangential demand before their normal load has built up, and slip (1.2 mm).
    const ramp = { pitch_deg: 14, material: material({ staticFriction: 0.3, kineticFriction: 0.2 }) };
    const settled = new Plant(plantConfig(ramp));
    const released = new Plant(plantConfig({ ...ramp, start: 'released' }));
    const startSettled = settled.footPosition_m.slice();
    const startReleased = released.footPosition_m.slice();
    settled.applyAction(holdPosture(settled));
    released.applyAction(holdPosture(released));
    runFor(settled, 2);
    runFor(released, 2);
    expect(footTravel_m(settled, startSettled)).toBeLessThan(1e-4);
    expect(footTravel_m(released, startReleased)).toBeGreaterThan(5e-4);
  });

  it('is refused with explicit feet or a moving trunk', () => {
    expect(() => new Plant(plantConfig({ start: 'settled', feet: [[0.25, 0.12, 0], [0.25, -0.12, 0], [-0.25, 0.12, 0], [-0.25, -0.12, 0]] }))).toThrow(/initial\.start/);
    expect(() => new Plant(plantConfig({ start: 'settled', velocity_mps: [0.1, 0, 0] }))).toThrow(/at rest/);
  });
});
