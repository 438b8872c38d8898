import { quantile } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { Histogram } from '../../harness/score/histogram.js';

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
