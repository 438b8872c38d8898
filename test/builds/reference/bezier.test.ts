// Cubic Bézier swing: endpoints are interpolated exactly (B(0) = P0, B(1) = P3 — the Bernstein
// basis is 1 at the ends; Farin, Curves and Surfaces for CAGD, ch. 4), the mid-swing height is
// the configured apex, and the Bernstein form agrees with de Casteljau's algorithm.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  bezierBernstein,
  bezierDeCasteljau,
  bezierDerivative,
  swingControlPoints,
} from '../../../harness/builds/reference/bezier.js';

const point = fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: 3, maxLength: 3 });

describe('Bézier swing curve', () => {
  it('hits lift-off and touchdown exactly', () => {
    fc.assert(
      fc.property(point, point, fc.double({ min: 0, max: 0.2, noNaN: true }), (a, b, apex) => {
        const p = swingControlPoints(new Float64Array(12), Float64Array.from(a), 0, Float64Array.from(b), 0, apex);
        const out = new Float64Array(3);
        // Exact equality (−0 and +0 count as equal, as they do for ===).
        bezierBernstein(out, 0, p, 0);
        for (let k = 0; k < 3; k++) expect(out[k] === a[k]).toBe(true);
        bezierBernstein(out, 0, p, 1);
        for (let k = 0; k < 3; k++) expect(out[k] === b[k]).toBe(true);
      }),
      { numRuns: 100, seed: 5 },
    );
  });

  it('reaches the configured apex above flat ground at mid-swing, and nowhere higher', () => {
    const apex = 0.06;
    const p = swingControlPoints(new Float64Array(12), Float64Array.from([0, 0, 0]), 0, Float64Array.from([0.2, 0.05, 0]), 0, apex);
    const out = new Float64Array(3);
    bezierBernstein(out, 0, p, 0.5);
    expect(out[2]).toBeCloseTo(apex, 14);
    let highest = 0;
    for (let k = 0; k <= 1000; k++) {
      bezierBernstein(out, 0, p, k / 1000);
      highest = Math.max(highest, out[2]);
    }
    expect(highest).toBeLessThanOrEqual(apex + 1e-15);
    // Lift-off and touchdown are vertical: zero horizontal velocity at both ends.
    bezierDerivative(out, 0, p, 0);
    expect([out[0], out[1]]).toEqual([0, 0]);
    bezierDerivative(out, 0, p, 1);
    expect([out[0], out[1]]).toEqual([0, 0]);
  });

  it('Bernstein and de Casteljau evaluation agree, and the derivative matches finite differences', () => {
    const scratch = new Float64Array(12);
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 12, maxLength: 12 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (c, s) => {
          const p = Float64Array.from(c);
          const a = new Float64Array(3), b = new Float64Array(3);
          bezierBernstein(a, 0, p, s);
          bezierDeCasteljau(b, 0, p, s, scratch);
          for (let k = 0; k < 3; k++) expect(Math.abs(a[k] - b[k])).toBeLessThan(1e-12);
          // Central difference, error O(h²·|B'''|) ≤ ~1e-6 here.
          const h = 1e-5, lo = Math.max(0, s - h), hi = Math.min(1, s + h);
          const plus = new Float64Array(3), minus = new Float64Array(3), d = new Float64Array(3);
          bezierBernstein(plus, 0, p, hi);
          bezierBernstein(minus, 0, p, lo);
          bezierDerivative(d, 0, p, (lo + hi) / 2);
          for (let k = 0; k < 3; k++) expect(Math.abs((plus[k] - minus[k]) / (hi - lo) - d[k])).toBeLessThan(1e-5);
        },
      ),
      { numRuns: 200, seed: 9 },
    );
  });
});
