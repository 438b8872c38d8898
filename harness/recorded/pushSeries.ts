// The push series of an imported scenario: the logged external-force estimate, or — when the log
// has none — the residual of Newton's law on the whole robot, f_ext = M·a − Σ f_feet − M·g.
// Residual assumptions (stated in docs/recorded.md): legs massless and feet light, so the trunk's
// acceleration stands for the whole robot's centre of mass; foot forces are the ground's forces
// on the feet; the trunk velocity is the centre of mass's. Samples whose force magnitude stays
// within five noise standard deviations of zero are no push (|n| of 3-D Gaussian noise is
// chi-distributed with 3 degrees of freedom: P(|n| > 5σ) ≈ 1.5e-5, from memory);
// the series keeps only the points needed to stay within one σ of the samples (Ramer–Douglas–
// Peucker on each component), so a 1 kHz log does not become a 1 kHz series file.

import { STANDARD_GRAVITY_mps2 } from '../plant/defaults.js';
import type { RobotParams } from '../plant/types.js';
import { round6 } from './commandTimeline.js';
import type { Trajectory } from '../scenario/trajectory.js';

export interface PushEstimate {
  /** Where the force came from. */
  source: 'externalForce' | 'residual';
  /** Threshold under which a sample is taken as no push, N. */
  threshold_N: number;
  t_s: number[];
  force_N: [number, number, number][];
  /** Largest force magnitude in the series, N. */
  peak_N: number;
}

/** Below this a force is never taken as a push, whatever the stated noise (common practice). */
const MIN_THRESHOLD_N = 1;
/** Gaps shorter than this between above-threshold samples belong to one push (common practice). */
const MERGE_GAP_s = 0.05;
/** Half-width of the central difference for the residual's acceleration (common practice: ~10 ms). */
const ACCELERATION_HALF_WINDOW_s = 0.01;

export function residualForce(tr: Trajectory, robot: RobotParams): Float64Array {
  const n = tr.footCount;
  const M = robot.trunk.mass_kg + n * robot.foot.mass_kg;
  const out = new Float64Array(3 * tr.count);
  let a = 0;
  let b = 0;
  for (let k = 0; k < tr.count; k++) {
    while (a < k && tr.t_s[k] - tr.t_s[a] > ACCELERATION_HALF_WINDOW_s) a++;
    if (b < k) b = k;
    while (b + 1 < tr.count && tr.t_s[b + 1] - tr.t_s[k] <= ACCELERATION_HALF_WINDOW_s) b++;
    const dt = tr.t_s[b] - tr.t_s[a];
    for (let c = 0; c < 3; c++) {
      const acc = dt > 0 ? (tr.trunkVelocity_mps[3 * b + c] - tr.trunkVelocity_mps[3 * a + c]) / dt : 0;
      let feet = 0;
      for (let i = 0; i < n; i++) feet += tr.footForce_N[3 * (n * k + i) + c];
      const gravity = c === 2 ? -STANDARD_GRAVITY_mps2 * M : 0;
      out[3 * k + c] = M * acc - feet - gravity;
    }
  }
  return out;
}

/** Median absolute deviation scaled to a Gaussian σ (1.4826·MAD, Hampel 1974). */
function robustSigma(values: Float64Array): number {
  const sorted = Float64Array.from(values).sort();
  const median = sorted[sorted.length >> 1];
  const deviations = sorted.map((v) => Math.abs(v - median)).sort();
  return 1.4826 * deviations[deviations.length >> 1];
}

export function estimatePushes(tr: Trajectory, robot: RobotParams, pushNoise_N: number): PushEstimate {
  const source = tr.externalForce_N ? 'externalForce' : 'residual';
  const force = tr.externalForce_N ?? residualForce(tr, robot);
  let sigma = pushNoise_N;
  if (source === 'residual') {
    const magnitudes = new Float64Array(tr.count);
    for (let k = 0; k < tr.count; k++) magnitudes[k] = force[3 * k + 1];
    sigma = Math.max(sigma, robustSigma(magnitudes));
  }
  const threshold_N = Math.max(MIN_THRESHOLD_N, 5 * sigma);
  const above = (k: number) => Math.hypot(force[3 * k], force[3 * k + 1], force[3 * k + 2]) > threshold_N;

  const keep = new Uint8Array(tr.count);
  let lastAbove = -1;
  for (let k = 0; k < tr.count; k++) {
    if (!above(k)) continue;
    if (lastAbove >= 0 && tr.t_s[k] - tr.t_s[lastAbove] <= MERGE_GAP_s) for (let j = lastAbove + 1; j < k; j++) keep[j] = 1;
    keep[k] = 1;
    lastAbove = k;
  }
  // Each push runs from a zero sample before it to a zero sample after it.
  const t_s: number[] = [];
  const force_N: [number, number, number][] = [];
  let peak_N = 0;
  for (let k = 0; k < tr.count; k++) {
    if (!keep[k]) continue;
    let end = k;
    while (end + 1 < tr.count && keep[end + 1]) end++;
    const first = Math.max(0, k - 1);
    const last = Math.min(tr.count - 1, end + 1);
    const points: { t: number; f: [number, number, number] }[] = [];
    for (let j = first; j <= last; j++) {
      const inside = j >= k && j <= end;
      points.push({ t: tr.t_s[j], f: inside ? [force[3 * j], force[3 * j + 1], force[3 * j + 2]] : [0, 0, 0] });
      if (inside) peak_N = Math.max(peak_N, Math.hypot(force[3 * j], force[3 * j + 1], force[3 * j + 2]));
    }
    for (const p of simplify(points, Math.max(sigma, 0.5))) {
      t_s.push(round6(p.t));
      force_N.push([round3(p.f[0]), round3(p.f[1]), round3(p.f[2])]);
    }
    k = end;
  }
  return { source, threshold_N, t_s, force_N, peak_N };
}

const round3 = (x: number) => Math.round(x * 1000) / 1000 + 0;

/** Ramer–Douglas–Peucker on a time series of vectors: largest component deviation ≤ tolerance. */
function simplify<T extends { t: number; f: [number, number, number] }>(points: T[], tolerance: number): T[] {
  if (points.length <= 2) return points;
  const keep = new Uint8Array(points.length);
  keep[0] = 1;
  keep[points.length - 1] = 1;
  const stack: [number, number][] = [[0, points.length - 1]];
  while (stack.length) {
    const [a, b] = stack.pop()!;
    let worst = -1;
    let worstDeviation = tolerance;
    for (let j = a + 1; j < b; j++) {
      const w = (points[j].t - points[a].t) / (points[b].t - points[a].t);
      for (let c = 0; c < 3; c++) {
        const deviation = Math.abs(points[a].f[c] + w * (points[b].f[c] - points[a].f[c]) - points[j].f[c]);
        if (deviation > worstDeviation) {
          worstDeviation = deviation;
          worst = j;
        }
      }
    }
    if (worst >= 0) {
      keep[worst] = 1;
      stack.push([a, worst], [worst, b]);
    }
  }
  return points.filter((_, j) => keep[j]);
}
