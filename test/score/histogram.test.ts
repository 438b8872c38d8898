import { quantile } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { FrictionMarginTracker, frictionMargin } from '../../harness/score/frictionMargin.js';
import { Histogram } from '../../harness/score/histogram.js';
import type { StepView } from '../../harness/score/sample.js';
import { StepPass } from '../../harness/score/stepPass.js';

// Deterministic values without Math.random: a 32-bit linear congruential generator (Numerical
// Recipes constants 1664525, 1013904223, from memory) mapped to [0, 1).
function uniforms(count: number, seed: number): number[] {
  let state = seed >>> 0;
  const out: number[] = [];
  for (let k = 0; k < count; k++) {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    out.push(state / 2 ** 32);
  }
  return out;
}

describe('Histogram quantiles', () => {
  it('match simple-statistics quantile within half a bin on linear bins', () => {
    const width = 0.001;
    for (const [count, seed] of [
      [1, 1],
      [2, 2],
      [3, 3],
      [17, 4],
      [1000, 5],
      [40_000, 6],
    ]) {
      const values = uniforms(count, seed).map((u) => 1 - 2 * u * u); // skewed towards 1, in (−1, 1]
      const histogram = Histogram.linear(-1, 1, width);
      for (const v of values) histogram.add(v);
      for (const p of [0, 0.01, 0.05, 0.5, 0.95, 1]) {
        // Reference: simple-statistics 7.12 `quantile` (linear interpolation, type 7).
        const exact = quantile(values, p);
        expect(Math.abs(histogram.quantile(p)! - exact)).toBeLessThanOrEqual(width / 2 + 1e-12);
      }
    }
  });

  it('match simple-statistics quantile within √ratio on log bins', () => {
    const ratio = 1.01;
    const values = uniforms(20_000, 9).map((u) => 20 * Math.exp(6 * u ** 4)); // 20 µs … 8 ms, long tail
    const histogram = Histogram.logarithmic(0.1, 1e7, ratio);
    for (const v of values) histogram.add(v);
    for (const p of [0.5, 0.9, 0.99, 0.999]) {
      const exact = quantile(values, p);
      expect(Math.abs(histogram.quantile(p)! / exact - 1)).toBeLessThanOrEqual(Math.sqrt(ratio) - 1 + 1e-12);
    }
    expect(histogram.max).toBe(Math.max(...values));
  });

  it('keeps the exact extremes for values outside its range and returns null when empty', () => {
    const histogram = Histogram.logarithmic(0.1, 1e7, 1.01);
    expect(histogram.quantile(0.5)).toBeNull();
    histogram.add(0);
    histogram.add(0.01);
    expect(histogram.quantile(0)).toBe(0);
    expect(histogram.quantile(1)).toBe(0.01);
    // Both fall in the first bin; its midpoint (0.1005) is clamped to the exact maximum.
    expect(histogram.quantile(0.5)).toBe(0.01);
  });

  it('ignores NaN', () => {
    const histogram = Histogram.linear(0, 1, 0.1);
    histogram.add(Number.NaN);
    histogram.add(0.25);
    expect(histogram.count).toBe(1);
    expect(histogram.quantile(0.5)).toBe(0.25);
  });
});

describe('one bin per margin, shared by the margin and stance histograms', () => {
  it('the step pass bins every loaded margin as frictionMargin() and Histogram.add do, and only loaded feet', () => {
    // 4000 feet-steps of random forces: margins over the whole range, the floor (−1) included.
    const pass = new StepPass({ footCount: 4, loadedThreshold_N: 5, slipSpeed_mps: 0.02, touchdownTransient_s: 0.02, duration_s: 10, settledStart: true, standingHeight_m: 0.3 });
    const reference = [0, 1, 2, 3].map(() => FrictionMarginTracker.marginHistogram());
    const force = new Float64Array(12);
    const friction = new Float64Array([0.5, 0.3, 0.9, 0]);
    const step = {
      time_s: 0, step_s: 0.001, lastStep_s: 0.001, stepWeight: 1, trunkGroundForce_N: 0,
      trunkPosition_m: new Float64Array([0, 0, 0.3]), trunkQuaternion: new Float64Array([1, 0, 0, 0]),
      footVelocity_mps: new Float64Array(12), footGroundForce_N: force, footStaticFriction: friction,
    } satisfies StepView;
    const held = { mode: new Uint8Array(4), wantedForce_N: new Float64Array(12) };
    const u = uniforms(12_000, 21);
    let loaded = 0;
    for (let k = 0; k < 1000; k++) {
      for (let j = 0; j < 12; j++) force[j] = j % 3 === 2 ? 10 * u[12 * k + j] : 8 * (u[12 * k + j] - 0.5);
      pass.recordStep(step, held);
      pass.endTick();
      for (let i = 0; i < 4; i++) {
        if (force[3 * i + 2] > 5) {
          loaded++;
          reference[i].add(frictionMargin(force[3 * i], force[3 * i + 1], force[3 * i + 2], friction[i]));
        }
      }
    }
    expect(loaded).toBeGreaterThan(1000); // about half the samples are loaded (f_n uniform in 0…10 N)
    for (let i = 0; i < 4; i++) {
      const histogram = pass.margin.outsideStance[i].emptyCopy();
      histogram.addAll(pass.margin.outsideStance[i]);
      histogram.addAll(pass.touchdown.stance[i]);
      expect(Array.from(histogram.counts)).toEqual(Array.from(reference[i].counts));
      expect([histogram.count, histogram.min, histogram.max]).toEqual([reference[i].count, reference[i].min, reference[i].max]);
    }
  });

  it('addBinnedWeightedFrom counts like addWeightedFrom', () => {
    const a = Histogram.linear(-1, 1, 0.001);
    const b = a.emptyCopy();
    const values = Float64Array.from(uniforms(5000, 22), (x) => 2 * x - 1);
    const bins = Int32Array.from(values, (x) => a.binOf(x));
    const weight = new Float64Array([0.25]);
    for (let k = 0; k < values.length; k++) {
      weight[0] = k % 3 === 0 ? 0.25 : 1;
      a.addWeightedFrom(values, k, weight);
      b.addBinnedWeightedFrom(bins, values, k, weight);
    }
    expect(Array.from(b.counts)).toEqual(Array.from(a.counts));
    expect([b.count, b.weight, b.min, b.max]).toEqual([a.count, a.weight, a.min, a.max]);
    expect(a.sameBins(b)).toBe(true);
    expect(a.sameBins(Histogram.linear(-1, 1, 0.002))).toBe(false);
  });
});

describe('Weighted histogram samples', () => {
  it('give the quantiles of the samples repeated: K samples of weight 1/K count as one', () => {
    // The landing-substep rule: a physics step cut into K substeps is K samples of weight 1/K, and
    // a percentile must not depend on K. Values spread over many bins, one of them split in 4.
    const whole = Histogram.linear(0, 1, 0.001);
    const split = Histogram.linear(0, 1, 0.001);
    const values = new Float64Array(1);
    const quarter = new Float64Array([0.25]);
    for (let k = 0; k < 200; k++) {
      const v = (k * 37) % 200 / 200;
      whole.add(v);
      values[0] = v;
      if (k % 10 === 3) for (let j = 0; j < 4; j++) split.addWeightedFrom(values, 0, quarter);
      else split.add(v);
    }
    expect(split.weight).toBeCloseTo(whole.weight, 12);
    expect(split.count).toBe(whole.count + 3 * 20);
    for (const p of [0, 0.01, 0.05, 0.5, 0.95, 1]) expect(split.quantile(p)).toBeCloseTo(whole.quantile(p)!, 12);
  });

  it('shift the quantile by their weight: a value of weight 3 among ones is three samples of it', () => {
    const weighted = Histogram.linear(0, 10, 0.01);
    const repeated = Histogram.linear(0, 10, 0.01);
    const values = new Float64Array([2.005]);
    weighted.addWeightedFrom(values, 0, new Float64Array([3]));
    for (let j = 0; j < 3; j++) repeated.add(2.005);
    for (const v of [1.005, 5.005, 7.005]) {
      weighted.add(v);
      repeated.add(v);
    }
    for (const p of [0.05, 0.3, 0.5, 0.7]) expect(weighted.quantile(p)).toBeCloseTo(repeated.quantile(p)!, 12);
  });
});
