// Friction identification from a recorded trajectory, per cell of a square grid the user picks.
//
// A loaded foot (f_n ≥ minNormalForce, in this sample and the one before — touch-down impacts
// are not friction samples) either sticks (tangential speed below stickSpeed) or slides (above
// slideSpeed); samples in between are ambiguous and unused. Coulomb–Stribeck friction
// (Armstrong-Hélouvry, Dupont & Canudas de Wit, Automatica 30(7), 1994) says:
// - a sticking foot holds |f_t| ≤ μs·f_n, so every sticking sample is a lower bound on μs;
// - a sliding foot feels |f_t| = μ(v)·f_n, μ(v) = μk + (μs − μk)·exp(−(v/v_s)^α), between μk and μs:
//   sliding samples are lower bounds on μs too, and fast ones measure μk.
// Lower bound, noise-proof: with force noise σ per component, (|f_t| − 5σ)/(f_n + 5σ) — a 2-D
// Gaussian exceeds 5σ with probability exp(−12.5) ≈ 4e-6 (Rayleigh tail), so the maximum over a
// long log stays a bound.
// μk: the Stribeck curve fitted to the sliding samples by least squares (μk and μs − μk linear,
// v_s on a log grid, α given); 95 % percentile interval of a block bootstrap over slide events
// (Efron & Tibshirani 1993, ch. 8: resampling whole events keeps the correlation within a slide).
// μs: a foot starts to slide when its force demand passes μs·f_n, so the ratio at a slide's onset
// (the sample before it and its first sample) is μs to within the noise, from below. The estimate
// is the 90th percentile of the events' onset ratios; the upper end is the largest onset ratio
// inflated by the noise, (|f_t| + 5σ)/(f_n − 5σ). That assumes the demand rises smoothly through
// the cone at some onsets (no impact); the lower end is the noise-proof bound.
// Where no foot slid, or too few slides, μs has the lower bound only and μk is unknown.

import { SeededRandom } from '../plant/random.js';
import type { ImportSettings } from './defaults.js';
import type { Trajectory } from '../scenario/trajectory.js';

export interface Interval {
  estimate: number;
  lower: number;
  upper: number;
}

export type RegionVerdict = 'slid' | 'lowerBoundOnly';

export interface RegionEstimate {
  /** Grid indices: x = origin.x + [i, i+1)·cell. */
  i: number;
  j: number;
  min_m: [number, number];
  max_m: [number, number];
  samples: { loaded: number; stick: number; slide: number };
  slideEvents: number;
  /** Noise-proof lower bound on μs from every loaded sample (null: no loaded sample). */
  staticLowerBound: number | null;
  verdict: RegionVerdict;
  /** Why only a lower bound, when verdict is lowerBoundOnly. */
  reason?: string;
  staticFriction?: Interval;
  kineticFriction?: Interval;
  stribeckVelocity_mps?: number;
}

export interface FrictionIdentification {
  cell_m: number;
  origin_m: [number, number];
  settings: ImportSettings['friction'] & { forceNoise_N: number };
  regions: RegionEstimate[];
}

/** Multiple of the force noise σ taken off the ratio's numerator and added to its denominator. */
const NOISE_ALLOWANCE_SIGMAS = 5;
/** Fewer slide events or samples than these in a cell give no curve fit (common practice). */
const MIN_SLIDE_EVENTS = 3;
const MIN_SLIDE_SAMPLES = 20;
const BOOTSTRAP_RESAMPLES = 400;
const BOOTSTRAP_SEED = 0x51ed;
/** Log grid of Stribeck velocities tried by the fit, m/s. */
const STRIBECK_GRID_mps = Array.from({ length: 61 }, (_, k) => 0.001 * Math.pow(10, (k / 60) * 3));

interface SlideSample {
  ratio: number;
  speed: number;
  event: number;
}

interface CellData {
  i: number;
  j: number;
  loaded: number;
  stick: number;
  lowerBound: number;
  slides: SlideSample[];
  events: Set<number>;
  /** Per slide event: the largest onset ratio and its noise-inflated upper value. */
  onsets: Map<number, { ratio: number; upper: number }>;
}

interface Fit {
  kinetic: number;
  staticFriction: number;
  stribeck: number;
}

/**
 * Sums the least-squares fit needs, per Stribeck-grid value: Σ1, Σe, Σe², Σr, Σe·r, Σr² with
 * e = exp(−(v/v_s)^α). Kept per slide event, so a bootstrap resample adds event sums instead of
 * revisiting samples (an hour-long log has hundreds of thousands of sliding samples).
 */
function eventSums(samples: SlideSample[], exponent: number): Float64Array {
  const g = STRIBECK_GRID_mps.length;
  const sums = new Float64Array(6 * g);
  for (const s of samples) {
    for (let k = 0; k < g; k++) {
      const e = Math.exp(-Math.pow(s.speed / STRIBECK_GRID_mps[k], exponent));
      const o = 6 * k;
      sums[o] += 1;
      sums[o + 1] += e;
      sums[o + 2] += e * e;
      sums[o + 3] += s.ratio;
      sums[o + 4] += e * s.ratio;
      sums[o + 5] += s.ratio * s.ratio;
    }
  }
  return sums;
}

/** Least-squares Stribeck fit from summed statistics (μk ≥ 0 free, μs − μk ≥ 0). */
function fitFromSums(sums: Float64Array): Fit {
  let best: Fit = { kinetic: 0, staticFriction: 0, stribeck: STRIBECK_GRID_mps[0] };
  let bestError = Number.POSITIVE_INFINITY;
  for (let k = 0; k < STRIBECK_GRID_mps.length; k++) {
    const o = 6 * k;
    const m = sums[o];
    const se = sums[o + 1];
    const see = sums[o + 2];
    const sr = sums[o + 3];
    const ser = sums[o + 4];
    const srr = sums[o + 5];
    const det = m * see - se * se;
    let excess = det > 1e-12 * m * m ? (m * ser - se * sr) / det : 0;
    let kinetic = (sr - excess * se) / m;
    if (excess < 0) {
      excess = 0;
      kinetic = sr / m;
    }
    // Σ(μk + Δ·e − r)², expanded.
    const error = srr - 2 * kinetic * sr - 2 * excess * ser + kinetic * kinetic * m + 2 * kinetic * excess * se + excess * excess * see;
    if (error < bestError - 1e-12 * Math.max(1, srr)) {
      bestError = error;
      best = { kinetic, staticFriction: kinetic + excess, stribeck: STRIBECK_GRID_mps[k] };
    }
  }
  return best;
}

function percentile(sorted: number[], p: number): number {
  const at = p * (sorted.length - 1);
  const lo = Math.floor(at);
  const hi = Math.ceil(at);
  return sorted[lo] + (at - lo) * (sorted[hi] - sorted[lo]);
}

export function identifyFriction(tr: Trajectory, settings: ImportSettings['friction'], forceNoise_N: number): FrictionIdentification {
  const n = tr.footCount;
  const { cell_m, origin_m } = settings;
  const cells = new Map<number, CellData>();
  const allowance = NOISE_ALLOWANCE_SIGMAS * forceNoise_N;
  let event = 0;
  const sliding = new Int32Array(n).fill(-1); // current event per foot, −1 when not sliding
  const wasLoaded = new Uint8Array(n);
  const previousRatio = new Float64Array(n);
  const previousUpper = new Float64Array(n);

  for (let k = 0; k < tr.count; k++) {
    for (let f = 0; f < n; f++) {
      const j3 = 3 * (n * k + f);
      const fn = tr.footForce_N[j3 + 2];
      const ft = Math.hypot(tr.footForce_N[j3], tr.footForce_N[j3 + 1]);
      const speed = Math.hypot(tr.footVelocity_mps[j3], tr.footVelocity_mps[j3 + 1]);
      const loadedBefore = wasLoaded[f] === 1;
      wasLoaded[f] = fn >= settings.minNormalForce_N ? 1 : 0;
      const isSliding = loadedBefore && fn >= settings.minNormalForce_N && speed > settings.slideSpeed_mps;
      const onsetBefore = previousRatio[f];
      const onsetUpperBefore = previousUpper[f];
      previousRatio[f] = fn > 0 ? ft / fn : 0;
      previousUpper[f] = fn > allowance ? (ft + allowance) / (fn - allowance) : Number.POSITIVE_INFINITY;
      if (!isSliding) sliding[f] = -1;
      if (fn < settings.minNormalForce_N || !loadedBefore) continue;
      const x = tr.footPosition_m[j3];
      const y = tr.footPosition_m[j3 + 1];
      const ci = Math.floor((x - origin_m[0]) / cell_m);
      const cj = Math.floor((y - origin_m[1]) / cell_m);
      // One number per cell (grids up to a million cells a side; a string key per sample costs more than the rest).
      const key = ci * 2_000_003 + cj;
      let cell = cells.get(key);
      if (!cell) {
        cell = { i: ci, j: cj, loaded: 0, stick: 0, lowerBound: Number.NEGATIVE_INFINITY, slides: [], events: new Set(), onsets: new Map() };
        cells.set(key, cell);
      }
      cell.loaded++;
      const bound = (ft - allowance) / (fn + allowance);
      const sticking = speed < settings.stickSpeed_mps;
      if (sticking || isSliding) cell.lowerBound = Math.max(cell.lowerBound, bound);
      if (sticking) cell.stick++;
      if (isSliding) {
        if (sliding[f] < 0) {
          sliding[f] = event++;
          const ratio = Math.max(onsetBefore, ft / fn);
          const upper = Math.max(onsetUpperBefore, fn > allowance ? (ft + allowance) / (fn - allowance) : Number.POSITIVE_INFINITY);
          cell.onsets.set(sliding[f], { ratio, upper });
        }
        cell.slides.push({ ratio: ft / fn, speed, event: sliding[f] });
        cell.events.add(sliding[f]);
      }
    }
  }

  const random = new SeededRandom(BOOTSTRAP_SEED);
  const regions = [...cells.values()]
    .sort((a, b) => a.i - b.i || a.j - b.j)
    .map((cell): RegionEstimate => {
      const base = {
        i: cell.i,
        j: cell.j,
        min_m: [origin_m[0] + cell.i * cell_m, origin_m[1] + cell.j * cell_m] as [number, number],
        max_m: [origin_m[0] + (cell.i + 1) * cell_m, origin_m[1] + (cell.j + 1) * cell_m] as [number, number],
        samples: { loaded: cell.loaded, stick: cell.stick, slide: cell.slides.length },
        slideEvents: cell.events.size,
        staticLowerBound: Number.isFinite(cell.lowerBound) ? Math.max(0, cell.lowerBound) : null,
      };
      if (cell.slides.length === 0) return { ...base, verdict: 'lowerBoundOnly', reason: 'no foot slid here' };
      if (cell.events.size < MIN_SLIDE_EVENTS || cell.slides.length < MIN_SLIDE_SAMPLES) {
        return { ...base, verdict: 'lowerBoundOnly', reason: `too few slides to fit (${cell.events.size} events, ${cell.slides.length} samples; need ${MIN_SLIDE_EVENTS} and ${MIN_SLIDE_SAMPLES})` };
      }
      const byEvent = new Map<number, SlideSample[]>();
      for (const s of cell.slides) {
        const list = byEvent.get(s.event);
        if (list) list.push(s);
        else byEvent.set(s.event, [s]);
      }
      const sums = [...byEvent.values()].map((samples) => eventSums(samples, settings.stribeckExponent));
      const total = new Float64Array(sums[0].length);
      for (const e of sums) for (let c = 0; c < total.length; c++) total[c] += e[c];
      const fit = fitFromSums(total);
      const kinetics: number[] = [];
      const resample = new Float64Array(total.length);
      for (let b = 0; b < BOOTSTRAP_RESAMPLES; b++) {
        resample.fill(0);
        for (let e = 0; e < sums.length; e++) {
          const picked = sums[Math.floor(random.uniform() * sums.length)];
          for (let c = 0; c < resample.length; c++) resample[c] += picked[c];
        }
        kinetics.push(fitFromSums(resample).kinetic);
      }
      kinetics.sort((a, b) => a - b);
      const onsets = [...cell.onsets.values()];
      const onsetRatios = onsets.map((o) => o.ratio).sort((a, b) => a - b);
      const lowerBound = base.staticLowerBound ?? 0;
      const sEstimate = Math.max(lowerBound, percentile(onsetRatios, 0.9));
      const sUpper = Math.max(sEstimate, ...onsets.map((o) => o.upper).filter(Number.isFinite));
      const kUpper = Math.min(sUpper, percentile(kinetics, 0.975));
      const kLower = Math.min(kUpper, Math.max(0, percentile(kinetics, 0.025)));
      // A fit whose v_s sits on the grid's edge saw no slow slides: v_s is not identified.
      const stribeckKnown = fit.stribeck > STRIBECK_GRID_mps[0] && fit.stribeck < STRIBECK_GRID_mps[STRIBECK_GRID_mps.length - 1];
      return {
        ...base,
        verdict: 'slid',
        staticFriction: { estimate: sEstimate, lower: lowerBound, upper: sUpper },
        kineticFriction: { estimate: Math.min(Math.max(fit.kinetic, kLower), kUpper, sEstimate), lower: kLower, upper: kUpper },
        ...(stribeckKnown ? { stribeckVelocity_mps: fit.stribeck } : {}),
      };
    });
  return { cell_m, origin_m, settings: { ...settings, forceNoise_N }, regions };
}
