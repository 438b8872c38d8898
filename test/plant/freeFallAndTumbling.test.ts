import { describe, expect, it } from 'vitest';
import odex from 'odex';
import { STANDARD_GRAVITY_mps2 } from '../../harness/plant/defaults.js';
import { Plant } from '../../harness/plant/plant.js';
import { matrixFromQuaternion } from '../../harness/plant/rotation.js';
import { limpAction, plantConfig, runFor, testRobot } from '../support/robots.js';

describe('free flight', () => {
  it('falls as z(t) = z0 − g·t²/2 with standard gravity, relative error < 1e-6 at 0.5 s', () => {
    // Standard gravity 9.80665 m/s² (CGPM 1901; ISO 80000-3); uniform acceleration from rest.
    const z0 = 3;
    const plant = new Plant(plantConfig({ position_m: [0, 0, z0], feet: [[0.25, 0.12, z0 - 0.3], [0.25, -0.12, z0 - 0.3], [-0.25, 0.12, z0 - 0.3], [-0.25, -0.12, z0 - 0.3]] }));
    plant.applyAction(limpAction(plant));
    runFor(plant, 0.5);
    const exact = z0 - (STANDARD_GRAVITY_mps2 * 0.5 ** 2) / 2;
    expect(plant.time_s).toBeCloseTo(0.5, 12);
    expect(Math.abs(plant.trunkPosition_m[2] - exact) / exact).toBeLessThan(1e-6);
    for (let i = 0; i < 4; i++) {
      const footExact = z0 - 0.3 - (STANDARD_GRAVITY_mps2 * 0.25) / 2;
      expect(Math.abs(plant.footPosition_m[3 * i + 2] - footExact) / footExact).toBeLessThan(1e-6);
    }
  });

  // A trunk tumbling in free flight (legs limp, end-stops out of reach, so no torque at all).
  const tumblingRobot = testRobot({
    leg: { minLength_m: 0, maxLength_m: 100, maxForce_N: 400, endStopStiffness_N_per_m: 0, endStopDamping_Ns_per_m: 0 },
  });
  const omega0: [number, number, number] = [0.4, 3.0, 0.6]; // near the intermediate axis: lively
  const duration_s = 10;

  function tumble(): { plant: Plant; samples: { t: number; w: number[] }[] } {
    const plant = new Plant(plantConfig({ robot: tumblingRobot, position_m: [0, 0, 1000], angularVelocity_radps: omega0, step_s: 0.0005 }));
    plant.applyAction(limpAction(plant));
    const samples: { t: number; w: number[] }[] = [];
    let k = 0;
    runFor(plant, duration_s, () => {
      if (++k % 2000 === 0) samples.push({ t: plant.time_s, w: Array.from(plant.trunkAngularVelocity_radps) });
    });
    return { plant, samples };
  }

  function energyAndMomentum(plant: Plant): { energy: number; momentum: number[] } {
    const I = tumblingRobot.trunk.inertia_kgm2;
    const w = plant.trunkAngularVelocity_radps;
    const Iw = [0, 1, 2].map((r) => I[r][0] * w[0] + I[r][1] * w[1] + I[r][2] * w[2]);
    const R = matrixFromQuaternion(new Float64Array(9), plant.trunkQuaternion);
    const momentum = [0, 1, 2].map((r) => R[3 * r] * Iw[0] + R[3 * r + 1] * Iw[1] + R[3 * r + 2] * Iw[2]);
    return { energy: 0.5 * (w[0] * Iw[0] + w[1] * Iw[1] + w[2] * Iw[2]), momentum };
  }

  it('conserves rotational energy and world angular momentum to < 1e-6 over 10 s', () => {
    // Torque-free rigid body: kinetic energy and spatial angular momentum are invariants
    // (Euler 1765; any classical mechanics text, e.g. Goldstein, Classical Mechanics, ch. 5).
    const start = new Plant(plantConfig({ robot: tumblingRobot, position_m: [0, 0, 1000], angularVelocity_radps: omega0 }));
    const before = energyAndMomentum(start);
    const { plant } = tumble();
    const after = energyAndMomentum(plant);
    expect(Math.abs(after.energy - before.energy) / before.energy).toBeLessThan(1e-6);
    const norm = Math.hypot(...before.momentum);
    const drift = Math.hypot(...after.momentum.map((l, i) => l - before.momentum[i]));
    expect(drift / norm).toBeLessThan(1e-6);
  });

  it('matches the odex (Hairer ODEX extrapolation) solution of Euler\'s equations to < 1e-5', () => {
    // Reference: npm `odex`, Gragg–Bulirsch–Stoer extrapolation (Hairer, Nørsett & Wanner,
    // Solving ODEs I), on I·ω̇ = −ω × I·ω, tolerance 1e-12.
    const I = tumblingRobot.trunk.inertia_kgm2;
    const Iinv = invert3(I);
    const euler = (_t: number, w: number[]): number[] => {
      const Iw = [0, 1, 2].map((r) => I[r][0] * w[0] + I[r][1] * w[1] + I[r][2] * w[2]);
      const c = [w[1] * Iw[2] - w[2] * Iw[1], w[2] * Iw[0] - w[0] * Iw[2], w[0] * Iw[1] - w[1] * Iw[0]];
      return [0, 1, 2].map((r) => -(Iinv[r][0] * c[0] + Iinv[r][1] * c[1] + Iinv[r][2] * c[2]));
    };
    const { samples } = tumble();
    expect(samples.length).toBe(10);
    const solver = new odex.Solver(3);
    solver.absoluteTolerance = solver.relativeTolerance = 1e-12;
    let worst = 0;
    let t0 = 0;
    let w = [...omega0];
    for (const sample of samples) {
      w = solver.solve(euler, t0, w, sample.t).y;
      t0 = sample.t;
      for (let a = 0; a < 3; a++) worst = Math.max(worst, Math.abs(w[a] - sample.w[a]));
    }
    expect(worst).toBeLessThan(1e-5);
  });
});

function invert3(m: number[][]): number[][] {
  const [[a, b, c], [d, e, f], [g, h, i]] = m;
  const A = e * i - f * h, B = -(d * i - f * g), C = d * h - e * g;
  const det = a * A + b * B + c * C;
  return [
    [A / det, -(b * i - c * h) / det, (b * f - c * e) / det],
    [B / det, (a * i - c * g) / det, -(a * f - c * d) / det],
    [C / det, -(a * h - b * g) / det, (a * e - b * d) / det],
  ];
}
