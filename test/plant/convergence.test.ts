import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY_mps2 } from '../../harness/plant/defaults.js';
import { DEFAULT_PHYSICS_STEP_s } from '../../harness/plant/defaults.js';
import { Plant } from '../../harness/plant/plant.js';
import { holdPosture, linearMomentum, material, plantConfig, runFor } from '../support/robots.js';
import { measureSteadyAllocation } from '../support/allocation.js';

// Halving the default step must change each checked quantity by less than the tolerance its own
// law test uses, so the default step is not what makes those tests pass.

function slidingAcceleration(step_s: number): number {
  const plant = new Plant(plantConfig({ pitch_deg: 20, step_s, material: material({ staticFriction: 0.3, kineticFriction: 0.2 }) }));
  plant.applyAction(holdPosture(plant));
  const m = new Float64Array(3);
  runFor(plant, 0.5);
  const v0 = linearMomentum(plant, m)[0];
  runFor(plant, 1.0);
  return -(linearMomentum(plant, m)[0] - v0) / plant.totalMass_kg;
}

function standingLoad(step_s: number): number {
  const plant = new Plant(plantConfig({ step_s }));
  plant.applyAction(holdPosture(plant));
  runFor(plant, 2.0);
  let sum = 0;
  for (let i = 0; i < 4; i++) sum += plant.footGroundForce_N[3 * i + 2];
  return sum;
}

function pushedSway(step_s: number): { x: number; yaw: number } {
  // A shove at the trunk's front corner on a dry floor: the trunk sways and twists on its legs.
  const plant = new Plant(
    plantConfig({ step_s, pushes: [{ kind: 'pulse', shape: 'rect', at_s: 0.5, duration_s: 0.1, force_N: [0, 60, 0], point_m: [0.3, 0, 0] }] }),
  );
  plant.applyAction(holdPosture(plant));
  let peakY = 0;
  runFor(plant, 1.0, () => {
    peakY = Math.max(peakY, plant.trunkPosition_m[1]);
  });
  return { x: peakY, yaw: plant.trunkQuaternion[3] };
}

describe('step convergence at the default step', () => {
  const h = DEFAULT_PHYSICS_STEP_s;
  it('sliding acceleration changes by < 2 % when the step is halved', () => {
    const a = slidingAcceleration(h);
    const b = slidingAcceleration(h / 2);
    expect(Math.abs(a - b) / b).toBeLessThan(0.02);
  });

  it('standing load changes by < 0.5 % when the step is halved', () => {
    const mg = 21 * STANDARD_GRAVITY_mps2;
    expect(Math.abs(standingLoad(h) - standingLoad(h / 2)) / mg).toBeLessThan(0.005);
  });

  it('the sway after an off-centre shove changes by < 2 % when the step is halved', () => {
    const a = pushedSway(h);
    const b = pushedSway(h / 2);
    expect(Math.abs(a.x - b.x) / Math.abs(b.x)).toBeLessThan(0.02);
    expect(Math.abs(a.yaw - b.yaw)).toBeLessThan(0.02 * Math.abs(b.yaw) + 1e-6);
  });
});

describe('the physics step allocates nothing', () => {
  it('runs 1e6 steps of the standing robot with no garbage collection', async () => {
    const plant = new Plant(plantConfig({ pushes: [{ kind: 'pulse', shape: 'halfSine', at_s: 0.1, duration_s: 0.2, force_N: [10, 0, 0], point_m: [0, 0, 0] }] }));
    plant.applyAction(holdPosture(plant));
    const result = await measureSteadyAllocation(1_000_000, () => plant.step(), (r) => r.collections === 0 && r.bytesPerCall < 1);
    // The smallest thing V8 allocates is a 12–16 byte heap number, so a step that allocated at
    // all would show ≥ 12 bytes per call (and scavenges); what remains below 1 byte per call is
    // one-off JIT and runtime bookkeeping spread over the million calls.
    expect(result.collections).toBe(0);
    expect(result.bytesPerCall).toBeLessThan(1);
  });
});
