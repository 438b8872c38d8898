// The push series of an import: from a logged external-force estimate (thresholded, simplified) or
// from the residual of Newton's second law on the whole robot, M·a = Σ f_feet + M·g + f_ext.

import { describe, expect, it } from 'vitest';
import { STANDARD_GRAVITY_mps2 } from '../../harness/plant/defaults.js';
import { estimatePushes, residualForce } from '../../harness/recorded/pushSeries.js';
import type { Trajectory } from '../../harness/scenario/trajectory.js';
import { testRobot } from '../support/robots.js';

/** A trajectory at 1 kHz whose trunk accelerates at `a` while the feet carry `footForce` each. */
function synthetic(count: number, a: [number, number, number], footForce: [number, number, number], external?: (t: number) => [number, number, number]): Trajectory {
  const n = 4;
  const tr: Trajectory = {
    footCount: n, count,
    t_s: Float64Array.from({ length: count }, (_, k) => k * 0.001),
    trunkPosition_m: new Float64Array(3 * count), trunkQuaternion: new Float64Array(4 * count), trunkVelocity_mps: new Float64Array(3 * count),
    footPosition_m: new Float64Array(3 * n * count), footVelocity_mps: new Float64Array(3 * n * count), footForce_N: new Float64Array(3 * n * count),
    contact: new Int8Array(n * count), commandVelocity_mps: new Float64Array(2 * count), commandYawRate_radps: new Float64Array(count), commandGait: new Int8Array(count),
    externalForce_N: external ? new Float64Array(3 * count) : null,
  };
  for (let k = 0; k < count; k++) {
    for (let c = 0; c < 3; c++) tr.trunkVelocity_mps[3 * k + c] = a[c] * tr.t_s[k];
    for (let i = 0; i < n; i++) for (let c = 0; c < 3; c++) tr.footForce_N[3 * (n * k + i) + c] = footForce[c];
    if (external && tr.externalForce_N) tr.externalForce_N.set(external(tr.t_s[k]), 3 * k);
  }
  return tr;
}

describe('push series', () => {
  it('residual: f_ext = M·a − Σ f_feet − M·g (Newton\'s second law on the whole robot)', () => {
    const robot = testRobot();
    const M = robot.trunk.mass_kg + 4 * robot.foot.mass_kg;
    const a: [number, number, number] = [0.5, -0.2, 0];
    // Feet carry the weight exactly; the sideways acceleration must come from outside.
    const tr = synthetic(200, a, [0, 0, (M * STANDARD_GRAVITY_mps2) / 4]);
    const f = residualForce(tr, robot);
    for (const k of [50, 100, 150]) {
      expect(f[3 * k]).toBeCloseTo(M * a[0], 9);
      expect(f[3 * k + 1]).toBeCloseTo(M * a[1], 9);
      expect(f[3 * k + 2]).toBeCloseTo(0, 9);
    }
  });

  it('keeps a logged push above the noise threshold, zero before and after, within σ of the samples', () => {
    const robot = testRobot();
    const M = robot.trunk.mass_kg + 4 * robot.foot.mass_kg;
    // A 60 N half-sine from 0.2 s to 0.5 s.
    const shove = (t: number): [number, number, number] => (t >= 0.2 && t <= 0.5 ? [0, 60 * Math.sin((Math.PI * (t - 0.2)) / 0.3), 0] : [0, 0, 0]);
    const tr = synthetic(1000, [0, 0, 0], [0, 0, (M * STANDARD_GRAVITY_mps2) / 4], shove);
    const push = estimatePushes(tr, robot, 1);
    expect(push.source).toBe('externalForce');
    expect(push.threshold_N).toBe(5);
    expect(push.force_N[0]).toEqual([0, 0, 0]);
    expect(push.force_N[push.force_N.length - 1]).toEqual([0, 0, 0]);
    expect(push.peak_N).toBeCloseTo(60, 3);
    expect(push.t_s.length).toBeLessThan(60); // simplified from ~300 samples above threshold
    // Linear interpolation of the kept points stays within σ = 1 N of every sample.
    for (let k = 0; k < tr.count; k++) {
      const t = tr.t_s[k];
      if (t < push.t_s[0] || t > push.t_s[push.t_s.length - 1]) continue;
      let j = 0;
      while (push.t_s[j + 1] < t) j++;
      const w = (t - push.t_s[j]) / (push.t_s[j + 1] - push.t_s[j]);
      const fy = push.force_N[j][1] + w * (push.force_N[j + 1][1] - push.force_N[j][1]);
      const truth = tr.externalForce_N![3 * k + 1];
      if (Math.abs(truth) > push.threshold_N) expect(Math.abs(fy - truth)).toBeLessThanOrEqual(1.001);
    }
  });
});
