// Force distribution: standing still, the stance forces sum to the total weight and reproduce the
// wanted wrench (Newton–Euler statics: Σf = M·|g|, Σ r × f = τ); random wrenches are reproduced by
// any full-rank stance; a two-foot stance keeps the force and gives up the unreachable moment.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ForceDistributor, wrenchOf } from '../../../harness/builds/reference/distribution.js';
import { matrixFromQuaternion, rotate } from '../../../harness/builds/reference/linalg.js';
import { STANDARD_GRAVITY_mps2 } from '../../../harness/plant/defaults.js';
import { testRobot } from '../../support/robots.js';

const robot = testRobot();
const mass = robot.trunk.mass_kg + 4 * robot.foot.mass_kg;

function arms(roll: number, pitch: number, yaw: number): Float64Array {
  const q = new Float64Array(4);
  // Z-Y-X quaternion.
  const cr = Math.cos(roll / 2), sr = Math.sin(roll / 2), cp = Math.cos(pitch / 2), sp = Math.sin(pitch / 2);
  const cy = Math.cos(yaw / 2), sy = Math.sin(yaw / 2);
  q[0] = cr * cp * cy + sr * sp * sy;
  q[1] = sr * cp * cy - cr * sp * sy;
  q[2] = cr * sp * cy + sr * cp * sy;
  q[3] = cr * cp * sy - sr * sp * cy;
  const r = matrixFromQuaternion(new Float64Array(9), q);
  const hips = new Float64Array(robot.hips_m.flat());
  const out = new Float64Array(12);
  for (let i = 0; i < 4; i++) rotate(out, 3 * i, r, hips, 3 * i);
  return out;
}

const distributor = () => new ForceDistributor(4, 1e-9, 1e-5, 2);

describe('least-squares force distribution', () => {
  it('standing still on four feet: Σ f = total weight within 1e-9 N and the wrench is reproduced', () => {
    const d = distributor();
    const all = new Uint8Array([1, 1, 1, 1]);
    const a = arms(0.02, -0.03, 0.4);
    expect(d.prepare(all, a)).toBe(true);
    const wrench = new Float64Array([0, 0, mass * STANDARD_GRAVITY_mps2, 0, 0, 0]);
    const f = d.solve(new Float64Array(12), wrench);
    let sum = 0;
    for (let i = 0; i < 4; i++) sum += f[3 * i + 2];
    expect(Math.abs(sum - mass * STANDARD_GRAVITY_mps2)).toBeLessThan(1e-9);
    const back = wrenchOf(new Float64Array(6), f, a, all, 4);
    for (let k = 0; k < 6; k++) expect(Math.abs(back[k] - wrench[k])).toBeLessThan(1e-9);
    // Symmetric hips, level trunk: each foot carries a quarter of the weight.
    const level = arms(0, 0, 0);
    d.prepare(all, level);
    d.solve(f, wrench);
    for (let i = 0; i < 4; i++) expect(f[3 * i + 2]).toBeCloseTo((mass * STANDARD_GRAVITY_mps2) / 4, 9);
  });

  it('reproduces random wrenches on any three or four feet', () => {
    const d = distributor();
    const stance = new Uint8Array(4);
    const f = new Float64Array(12);
    const back = new Float64Array(6);
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -200, max: 200, noNaN: true }), { minLength: 6, maxLength: 6 }),
        fc.integer({ min: -1, max: 3 }),
        fc.double({ min: -0.3, max: 0.3, noNaN: true }),
        (w, lifted, yaw) => {
          stance.fill(1);
          if (lifted >= 0) stance[lifted] = 0;
          const a = arms(0.05, 0.02, yaw);
          d.prepare(stance, a);
          // Moments of a few tens of N·m at most for a robot of this size.
          const wrench = new Float64Array([w[0], w[1], w[2], w[3] / 10, w[4] / 10, w[5] / 10]);
          d.solve(f, wrench);
          wrenchOf(back, f, a, stance, 4);
          for (let k = 0; k < 6; k++) expect(Math.abs(back[k] - wrench[k])).toBeLessThan(1e-8 * (1 + Math.abs(wrench[k])));
          if (lifted >= 0) expect(f.slice(3 * lifted, 3 * lifted + 3).every((x) => x === 0)).toBe(true);
        },
      ),
      { numRuns: 200, seed: 3 },
    );
  });

  it('on a trot diagonal keeps the total force and drops only the moment about the diagonal', () => {
    const d = distributor();
    const stance = new Uint8Array([1, 0, 0, 1]);
    const a = arms(0, 0, 0);
    d.prepare(stance, a);
    // Diagonal FL–HR direction: the moment along it cannot be produced by forces at two points on it.
    const ux = a[0] - a[9], uy = a[1] - a[10];
    const n = Math.hypot(ux, uy);
    const wrench = new Float64Array([3, -2, 110, 4 * (ux / n) + 1, 4 * (uy / n), 0.5]);
    const f = d.solve(new Float64Array(12), wrench);
    const back = wrenchOf(new Float64Array(6), f, a, stance, 4);
    for (let k = 0; k < 3; k++) expect(Math.abs(back[k] - wrench[k])).toBeLessThan(1e-6);
    // The moment across the diagonal and about z are reproduced; along the diagonal it is lost.
    const along = (back[3] * ux + back[4] * uy) / n;
    const across = (-back[3] * uy + back[4] * ux) / n;
    const wantedAcross = (-wrench[3] * uy + wrench[4] * ux) / n;
    expect(Math.abs(across - wantedAcross)).toBeLessThan(1e-6);
    expect(Math.abs(back[5] - wrench[5])).toBeLessThan(1e-6);
    expect(Math.abs(along)).toBeLessThan(1e-6);
  });
});
