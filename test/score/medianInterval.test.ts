import { binomialDistribution } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../harness/plant/random.js';
import { binomialHalfCdf, medianInterval, minimumSamplesFor } from '../../harness/score/medianInterval.js';

describe('order-statistic confidence interval of a median', () => {
  it('matches the binomial lower tail of a reference library at every k', () => {
    // simple-statistics' binomialDistribution is the reference; sums of its masses are the CDF.
    // It stops listing masses once the tail left is below its epsilon, so compare where it lists.
    for (const n of [5, 20, 31, 60]) {
      const masses = binomialDistribution(n, 0.5) ?? [];
      let cdf = 0;
      for (let k = 0; k < Math.min(n, masses.length); k++) {
        cdf += masses[k];
        expect(binomialHalfCdf(n, k)).toBeCloseTo(cdf, 10);
      }
    }
  });

  it('uses the 6th and 15th of 20 ordered values at 95 % (coverage 0.9586)', () => {
    // Worked value: P(Bin(20, ½) ≤ 5) = 0.0207, so ranks (6, 15) cover with 1 − 2·0.0207 = 0.9586
    // (Conover 1999, §3.2, table of binomial probabilities).
    const values = Array.from({ length: 20 }, (_, i) => 20 - i); // 20, 19, …, 1: any order
    const ci = medianInterval(values, 0.95);
    expect(ci.lowerRank).toBe(6);
    expect(ci.upperRank).toBe(15);
    expect(ci.lower).toBe(6);
    expect(ci.upper).toBe(15);
    expect(ci.coverage).toBeCloseTo(0.9586, 4);
    expect(ci.median).toBe(10.5);
  });

  it('uses the 10th and 22nd of 31 at 95 %, the gate default', () => {
    // P(Bin(31, ½) ≤ 9) = 0.0147 and ≤ 10 = 0.0354: k = 10 is the largest rank keeping 95 %.
    const ci = medianInterval(Array.from({ length: 31 }, (_, i) => i + 1), 0.95);
    expect([ci.lowerRank, ci.upperRank]).toEqual([10, 22]);
    expect(ci.coverage).toBeGreaterThanOrEqual(0.95);
    expect(ci.median).toBe(16);
  });

  it('has no interval below the minimum sample count and says so', () => {
    // 1 − 2·2⁻ⁿ ≥ 0.95 first holds at n = 6 (2⁻⁵ = 0.031 > 0.025, 2⁻⁶ = 0.0156).
    expect(minimumSamplesFor(0.95)).toBe(6);
    const ci = medianInterval([1, 2, 3, 4, 5], 0.95);
    expect(ci.lower).toBeNull();
    expect(ci.upper).toBeNull();
    expect(ci.median).toBe(3);
  });

  it('covers the true median at least as often as promised on skewed, heavy-tailed data', () => {
    // Lognormal(0, 1) has median exactly 1 (e⁰). 4000 samples of 31: the empirical coverage must
    // reach the exact coverage 0.9706 within 3 binomial standard errors (≈ 0.008).
    const random = new SeededRandom(20261202);
    let covered = 0;
    const trials = 4000;
    const sample = new Float64Array(31);
    for (let t = 0; t < trials; t++) {
      for (let i = 0; i < sample.length; i++) sample[i] = Math.exp(random.normal());
      const ci = medianInterval(sample, 0.95);
      if ((ci.lower as number) <= 1 && 1 <= (ci.upper as number)) covered++;
    }
    const rate = covered / trials;
    const se = Math.sqrt((0.9706 * 0.0294) / trials);
    expect(rate).toBeGreaterThan(0.9706 - 3 * se);
  });

  it('refuses non-finite samples and empty input with a message', () => {
    expect(() => medianInterval([], 0.95)).toThrow(/no samples/);
    expect(() => medianInterval([1, Number.NaN, 3], 0.95)).toThrow(/not finite/);
    expect(() => medianInterval([1, 2, 3], 1.5)).toThrow(/confidence/);
  });
});
