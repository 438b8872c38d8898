import { describe, expect, it } from 'vitest';
import { PlantConfigError, PlantDivergedError } from '../../harness/plant/errors.js';
import { Plant } from '../../harness/plant/plant.js';
import { holdPosture, material, plantConfig, runFor, testRobot } from '../support/robots.js';

describe('plant parameters that make no physical sense are refused', () => {
  const robot = testRobot();
  const cases: [string, () => unknown, RegExp][] = [
    ['non-positive trunk mass', () => new Plant(plantConfig({ robot: { ...robot, trunk: { ...robot.trunk, mass_kg: 0 } } })), /robot\.trunk\.mass_kg = 0: expected a positive number/],
    ['inertia not positive definite', () => new Plant(plantConfig({ robot: { ...robot, trunk: { ...robot.trunk, inertia_kgm2: [[1, 2, 0], [2, 1, 0], [0, 0, 1]] } } })), /inertia_kgm2 .*positive-definite/],
    ['asymmetric inertia', () => new Plant(plantConfig({ robot: { ...robot, trunk: { ...robot.trunk, inertia_kgm2: [[1, 0.1, 0], [0, 1, 0], [0, 0, 1]] } } })), /inertia_kgm2\[0\]\[1\] = 0\.1: expected equal to \[1\]\[0\]/],
    ['μk > μs', () => new Plant(plantConfig({ material: material({ staticFriction: 0.3, kineticFriction: 0.5 }) })), /ground\.friction\.default\.kineticFriction = 0\.5: expected ≤ staticFriction \(0\.3\)/],
    ['negative stiffness', () => new Plant(plantConfig({ contact: { stiffness_N_per_m: -5, exponent: 1.5, damping_s_per_m: 0 } })), /ground\.contact\.stiffness_N_per_m = -5/],
    ['NaN anywhere', () => new Plant(plantConfig({ robot: { ...robot, foot: { mass_kg: Number.NaN } } })), /robot\.foot\.mass_kg = NaN: expected a finite number/],
  ];
  it.each(cases)('%s', (_name, build, message) => {
    expect(build).toThrow(PlantConfigError);
    expect(build).toThrow(message);
  });

  it('allows a frictionless floor (μs = μk = 0)', () => {
    expect(() => new Plant(plantConfig({ material: material({ staticFriction: 0, kineticFriction: 0 }) }))).not.toThrow();
  });
});

describe('a simulation that goes non-finite', () => {
  it('stops at that step and says when and which quantity', () => {
    const plant = new Plant(plantConfig());
    const action = holdPosture(plant);
    action.groundForce_N[5] = Number.POSITIVE_INFINITY; // a build that sends an infinite force
    plant.applyAction(action);
    let error: unknown;
    try {
      runFor(plant, 0.01);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(PlantDivergedError);
    expect((error as PlantDivergedError).time_s).toBeCloseTo(0.0005, 9);
    expect(String(error)).toMatch(/diverged at t = 0\.000500 s: .* is not finite/);
  });
});
