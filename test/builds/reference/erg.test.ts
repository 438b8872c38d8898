// Explicit reference governor on a model where the answer is known: two decoupled double
// integrators p̈ = u under PD, u = k_p·(v − p) − k_d·ṗ, with position constraints (a polygon)
// and input bounds |u| ≤ u_max. Steady state x̄_v = (v, 0), so the steady-state admissible
// references are the polygon itself. Theory (Garone & Nicotra 2016; Nicotra & Garone 2018):
// starting at an admissible equilibrium, the state never leaves the constraint set, an
// admissible target (at least ζ inside) is reached, and an inadmissible one ends with v on the
// boundary layer between δ and ζ from the nearest constraint.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ExplicitReferenceGovernor, STEADY, invertSymmetric, pdLyapunov } from '../../../harness/builds/reference/erg.js';

const KP = 4; // ω = 2 rad/s
const KD = 4; // ζ = 1: critically damped, so e^{At} has the closed form used below
const OMEGA = 2;
const U_MAX = 3;
const T = 0.01;
const ZETA = 0.1;
const DELTA = 0.02;
/** Position polygon a·p ≤ b: the box [−1, 1]² cut by x + y ≤ 1.5. */
const POLYGON: [number, number, number][] = [
  [1, 0, 1],
  [-1, 0, 1],
  [0, 1, 1],
  [0, -1, 1],
  [Math.SQRT1_2, Math.SQRT1_2, 1.5 * Math.SQRT1_2],
];

function makeGovernor(): ExplicitReferenceGovernor {
  const block = pdLyapunov(new Float64Array(3), KP, KD, KP, 1);
  const p = new Float64Array(16);
  for (const a of [0, 2]) {
    p[a * 4 + a] = block[0];
    p[a * 4 + a + 1] = block[1];
    p[(a + 1) * 4 + a] = block[1];
    p[(a + 1) * 4 + a + 1] = block[2];
  }
  // z = (p_x − v_x, ṗ_x, p_y − v_y, ṗ_y): moving v by δv moves z_p by −δv.
  const jump = [-1, 0, 0, 0, 0, -1, 0, 0];
  const erg = new ExplicitReferenceGovernor({
    referenceDimension: 2,
    stateDimension: 4,
    maxConstraints: POLYGON.length + 4,
    lyapunov: p,
    jump,
    gain: 200,
    smoothing: 0.01,
    influence: ZETA,
    margin: DELTA,
    period_s: T,
  });
  let k = 0;
  for (const [ax, ay, b] of POLYGON) {
    // a·p = a·(z_p + v) ≤ b.
    erg.rows.set([ax, 0, ay, 0], k * 4);
    erg.referenceRows.set([ax, ay], k * 2);
    erg.bounds[k] = b;
    erg.kinds[k] = STEADY;
    erg.refreshConstraint(k++);
  }
  for (const axis of [0, 1]) {
    for (const sign of [1, -1]) {
      // ±u = ±(−k_p·z_p − k_d·ṗ) ≤ u_max.
      const row = [0, 0, 0, 0];
      row[2 * axis] = -sign * KP;
      row[2 * axis + 1] = -sign * KD;
      erg.rows.set(row, k * 4);
      erg.referenceRows.set([0, 0], k * 2);
      erg.bounds[k] = U_MAX;
      erg.kinds[k] = STEADY;
      erg.refreshConstraint(k++);
    }
  }
  erg.count = k;
  return erg;
}

/** Exact flow of the critically damped error dynamics over t (e^{At} in closed form). */
function flow(z: Float64Array, o: number, t: number): void {
  const e = Math.exp(-OMEGA * t);
  const x = z[o], v = z[o + 1];
  z[o] = e * (x * (1 + OMEGA * t) + v * t);
  z[o + 1] = e * (v * (1 - OMEGA * t) - OMEGA * OMEGA * t * x);
}

/** Largest constraint value minus bound over the state (≤ 0 means admissible). */
function worstViolation(position: number[], velocity: number[]): number {
  let worst = -Infinity;
  for (const [ax, ay, b] of POLYGON) worst = Math.max(worst, ax * position[0] + ay * position[1] - b);
  return worst;
}

function inputViolation(z: Float64Array): number {
  let worst = -Infinity;
  for (const axis of [0, 1]) worst = Math.max(worst, Math.abs(-KP * z[2 * axis] - KD * z[2 * axis + 1]) - U_MAX);
  return worst;
}

interface Outcome {
  maxViolation: number;
  final: [number, number];
  lastStep: number;
}

function simulate(start: [number, number], target: [number, number], steps: number): Outcome {
  const erg = makeGovernor();
  erg.applied[0] = start[0];
  erg.applied[1] = start[1];
  const position = [start[0], start[1]];
  const speed = [0, 0];
  const z = new Float64Array(4);
  let maxViolation = -Infinity;
  let lastStep = 0;
  for (let k = 0; k < steps; k++) {
    for (const axis of [0, 1]) {
      z[2 * axis] = position[axis] - erg.applied[axis];
      z[2 * axis + 1] = speed[axis];
    }
    const before0 = erg.applied[0], before1 = erg.applied[1];
    erg.update(z, target);
    lastStep = Math.hypot(erg.applied[0] - before0, erg.applied[1] - before1);
    // Hold v over the period and integrate exactly, checking the constraints on a fine grid.
    for (const axis of [0, 1]) {
      z[2 * axis] = position[axis] - erg.applied[axis];
      z[2 * axis + 1] = speed[axis];
    }
    const sub = 5;
    for (let s = 0; s < sub; s++) {
      flow(z, 0, T / sub);
      flow(z, 2, T / sub);
      const p = [z[0] + erg.applied[0], z[2] + erg.applied[1]];
      maxViolation = Math.max(maxViolation, worstViolation(p, [z[1], z[3]]), inputViolation(z));
    }
    for (const axis of [0, 1]) {
      position[axis] = z[2 * axis] + erg.applied[axis];
      speed[axis] = z[2 * axis + 1];
    }
  }
  return { maxViolation, final: [erg.applied[0], erg.applied[1]], lastStep };
}

function distanceInside(point: [number, number]): number {
  let d = Infinity;
  for (const [ax, ay, b] of POLYGON) d = Math.min(d, b - (ax * point[0] + ay * point[1]));
  return d;
}

const coordinate = fc.double({ min: -0.85, max: 0.85, noNaN: true });
const far = fc.double({ min: -4, max: 4, noNaN: true });

describe('explicit reference governor on a double integrator under PD', () => {
  it('P solves the Lyapunov equation AᵀP + PA = −Q of the PD error dynamics', () => {
    // Direct substitution into the 2×2 Lyapunov equation (textbook identity).
    const [p11, p12, p22] = pdLyapunov(new Float64Array(3), KP, KD, 2, 0.5);
    expect(-2 * KP * p12).toBeCloseTo(-2, 12);
    expect(p11 - KD * p12 - KP * p22).toBeCloseTo(0, 12);
    expect(2 * (p12 - KD * p22)).toBeCloseTo(-0.5, 12);
    const inv = invertSymmetric([p11, p12, p12, p22], 2);
    expect(p11 * inv[0] + p12 * inv[2]).toBeCloseTo(1, 12);
  });

  it('reaches admissible targets without ever leaving the constraint set', () => {
    fc.assert(
      fc.property(coordinate, coordinate, coordinate, coordinate, (sx, sy, tx, ty) => {
        const start: [number, number] = [sx, sy];
        const target: [number, number] = [tx, ty];
        fc.pre(distanceInside(start) > DELTA && distanceInside(target) > ZETA + 0.01);
        const out = simulate(start, target, 3000);
        expect(out.maxViolation).toBeLessThanOrEqual(1e-9);
        expect(Math.hypot(out.final[0] - tx, out.final[1] - ty)).toBeLessThan(1e-3);
      }),
      { numRuns: 40, seed: 7 },
    );
  });

  it('ends in the boundary layer (between δ and ζ from the edge) for inadmissible targets, never violating', () => {
    fc.assert(
      fc.property(coordinate, coordinate, far, far, (sx, sy, tx, ty) => {
        const start: [number, number] = [sx, sy];
        fc.pre(distanceInside(start) > DELTA && distanceInside([tx, ty]) < -0.05);
        const out = simulate(start, [tx, ty], 3000);
        expect(out.maxViolation).toBeLessThanOrEqual(1e-9);
        const inside = distanceInside(out.final);
        expect(inside).toBeGreaterThanOrEqual(DELTA - 1e-6);
        expect(inside).toBeLessThanOrEqual(ZETA);
        // It went toward the target; what may remain is a slow slide along an edge toward the
        // boundary point nearest the target (the attraction's tangential part fades there).
        expect(Math.hypot(out.final[0] - tx, out.final[1] - ty)).toBeLessThan(Math.hypot(sx - tx, sy - ty));
        expect(out.lastStep).toBeLessThan(T * 1); // slower than 1 m/s: no longer a free run
      }),
      { numRuns: 40, seed: 11 },
    );
  });

  it('the checks are not vacuous: applying the target at once violates the input bound', () => {
    // Step of 1.5 m under k_p = 4: u(0) = 6 > u_max = 3.
    const z = new Float64Array([-1.5, 0, 0, 0]);
    expect(inputViolation(z)).toBeGreaterThan(0);
    const governed = simulate([-0.75, 0], [0.75, 0], 1);
    expect(governed.maxViolation).toBeLessThanOrEqual(0);
  });

  it('keeps the applied reference still while the tracking error is above the threshold', () => {
    const erg = makeGovernor();
    const z = new Float64Array([0, 5, 0, 0]); // a violent velocity error: V ≫ Γ
    erg.update(z, [0.5, 0.5]);
    expect(erg.delta).toBe(0);
    expect(Array.from(erg.applied)).toEqual([0, 0]);
  });
});
