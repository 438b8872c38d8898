// QP force distribution (npm quadprog, Goldfarb & Idnani 1983): when the least-squares forces
// already satisfy the pyramid and normal band, the QP returns them (its objective's minimiser);
// when they do not, the QP returns feasible forces whose wrench error is no larger than that of
// the naive per-foot clip (the clip is feasible, so it cannot beat the QP's optimum).

import { describe, expect, it } from 'vitest';
import { ForceDistributor, wrenchOf } from '../../../harness/builds/reference/distribution.js';
import { clampIntoPyramid } from '../../../harness/builds/reference/pyramid.js';
import { QuadraticDistributor } from '../../../harness/builds/reference/qp.js';
import { STANDARD_GRAVITY_mps2 } from '../../../harness/plant/defaults.js';
import { testRobot } from '../../support/robots.js';

const robot = testRobot();
const arms = new Float64Array(robot.hips_m.flat());
const weight = (robot.trunk.mass_kg + 4 * robot.foot.mass_kg) * STANDARD_GRAVITY_mps2;
const L = 0.28;

function leastSquares(stance: Uint8Array, wrench: number[]): Float64Array {
  const d = new ForceDistributor(4, 1e-9, 1e-5, 2);
  d.prepare(stance, arms);
  return d.solve(new Float64Array(12), Float64Array.from(wrench));
}

function weightedError(f: Float64Array, stance: Uint8Array, wrench: number[]): number {
  const w = wrenchOf(new Float64Array(6), f, arms, stance, 4);
  let e = 0;
  for (let k = 0; k < 6; k++) e += (k < 3 ? 1 : 1 / (L * L)) * (w[k] - wrench[k]) ** 2;
  return e;
}

describe('QP force distribution', () => {
  it('equals the unconstrained least-squares solution when no constraint is active', () => {
    const qp = new QuadraticDistributor(4, L);
    const pyramid = new Float64Array([0.6, 0.6, 0.6, 0.6]);
    for (const stance of [new Uint8Array([1, 1, 1, 1]), new Uint8Array([1, 0, 0, 1]), new Uint8Array([1, 1, 1, 0])]) {
      const wrench = [4, -3, weight, 0.5, -0.8, 0.3];
      const ls = leastSquares(stance, wrench);
      const f = Float64Array.from(ls);
      // A three-foot stance puts ≈ 3.7 N on the foot beside the lifted one: a 2 N floor keeps it inactive.
      expect(qp.solve(f, stance, arms, pyramid, new Float64Array([1, 0, 2, 300]))).toBe(true);
      expect(qp.activeConstraints).toBe(0);
      for (let k = 0; k < 12; k++) expect(Math.abs(f[k] - ls[k])).toBeLessThan(1e-6);
    }
  });

  it('returns feasible forces at least as close to the wrench as the per-foot clip when friction binds', () => {
    const qp = new QuadraticDistributor(4, L);
    const mu = 0.12;
    const pyramid = new Float64Array([mu, mu, mu, mu]);
    const stance = new Uint8Array([1, 1, 1, 1]);
    const wrench = [40, 15, weight, 2, -3, 4]; // asks for 0.2·weight sideways: beyond μ' = 0.12
    const ls = leastSquares(stance, wrench);
    const f = Float64Array.from(ls);
    expect(qp.solve(f, stance, arms, pyramid, new Float64Array([1, 0, 5, 300]))).toBe(true);
    expect(qp.activeConstraints).toBeGreaterThan(0);
    for (let i = 0; i < 4; i++) {
      const fz = f[3 * i + 2];
      expect(Math.abs(f[3 * i])).toBeLessThanOrEqual(mu * fz + 1e-9);
      expect(Math.abs(f[3 * i + 1])).toBeLessThanOrEqual(mu * fz + 1e-9);
      expect(fz).toBeGreaterThanOrEqual(5 - 1e-9);
    }
    const clipped = Float64Array.from(ls);
    for (let i = 0; i < 4; i++) clampIntoPyramid(clipped, i, pyramid, new Float64Array([1, 0, 5, 300]));
    // The QP minimises ‖A(f − f_LS)‖²_W + λ‖f − f_LS‖²; A·f_LS = w here, so up to λ = 1e-3 it
    // minimises the weighted wrench error.
    expect(weightedError(f, stance, wrench)).toBeLessThanOrEqual(weightedError(clipped, stance, wrench) * (1 + 1e-3) + 1e-9);
  });
});
