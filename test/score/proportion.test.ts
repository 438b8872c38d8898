import { errorFunction } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { differenceInterval, normalQuantile, twoSidedZ, wilsonInterval } from '../../harness/score/proportion.js';

/** Two-sided z from a standard normal table (any statistics handbook), 6 decimals. */
const Z_TABLE: Record<number, number> = { 0.8: 1.281552, 0.95: 1.959964, 0.99: 2.575829 };

/** Wilson's formula written out independently, with z from the normal table. */
function wilsonFromFormula(k: number, n: number, confidence: number): [number, number] {
  const z = Z_TABLE[confidence];
  const p = k / n;
  const denominator = 1 + (z * z) / n;
  const centre = p + (z * z) / (2 * n);
  const spread = z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  return [(centre - spread) / denominator, (centre + spread) / denominator];
}

describe('normal quantile', () => {
  it('inverts the normal CDF built from simple-statistics errorFunction across the range', () => {
    // Φ(x) = (1 + erf(x/√2))/2. simple-statistics' erf is good to ≈1e-7 absolute; its probit is
    // not used because it is only good to ≈3e-3 (probit(0.975) = 1.9572 against 1.95996).
    const cdf = (x: number) => (1 + errorFunction(x / Math.SQRT2)) / 2;
    for (const p of [1e-6, 0.001, 0.01, 0.02425, 0.05, 0.1, 0.3, 0.5, 0.7, 0.9, 0.975, 0.99, 0.999999]) {
      expect(Math.abs(cdf(normalQuantile(p)) - p)).toBeLessThan(5e-7);
    }
  });

  it('matches normal-table values', () => {
    for (const [confidence, z] of Object.entries(Z_TABLE)) expect(twoSidedZ(Number(confidence))).toBeCloseTo(z, 5);
  });

  it('gives the textbook 1.95996 for a two-sided 95 % interval', () => {
    // z₀.₉₇₅ = 1.959964 (any normal table).
    expect(twoSidedZ(0.95)).toBeCloseTo(1.959964, 6);
  });
});

describe('Wilson score interval (Wilson 1927, JASA 22:209)', () => {
  it('gives ≈ [0.49, 0.94] for 8 successes of 10 at 95 %', () => {
    const w = wilsonInterval(8, 10, 0.95);
    expect(w.lower).toBeCloseTo(0.49, 2);
    expect(w.upper).toBeCloseTo(0.94, 2);
    const [lower, upper] = wilsonFromFormula(8, 10, 0.95);
    expect(w.lower).toBeCloseTo(lower, 6);
    expect(w.upper).toBeCloseTo(upper, 6);
  });

  it('matches the formula (z from simple-statistics) for many counts and confidences', () => {
    for (const n of [1, 3, 10, 37, 200]) {
      for (const k of [0, 1, Math.floor(n / 2), n - 1, n].filter((x) => x >= 0 && x <= n)) {
        for (const confidence of [0.8, 0.95, 0.99]) {
          const w = wilsonInterval(k, n, confidence);
          const [lower, upper] = wilsonFromFormula(k, n, confidence);
          expect(w.lower).toBeCloseTo(Math.max(0, lower), 6);
          expect(w.upper).toBeCloseTo(Math.min(1, upper), 6);
        }
      }
    }
  });

  it('reproduces worked examples: 15 of 148 → [0.0624, 0.1605], 0 of 10 → [0, 0.2775]', () => {
    // Newcombe 1998, Statistics in Medicine 17:857 (single-proportion paper), Table I, from memory.
    const a = wilsonInterval(15, 148);
    expect(a.lower).toBeCloseTo(0.0624, 4);
    expect(a.upper).toBeCloseTo(0.1605, 4);
    const b = wilsonInterval(0, 10);
    expect(b.lower).toBe(0);
    expect(b.upper).toBeCloseTo(0.2775, 4);
  });

  it('refuses counts that are not proportions', () => {
    expect(() => wilsonInterval(11, 10)).toThrow(/11 successes of 10 trials/);
    expect(() => wilsonInterval(1, 0)).toThrow(/0 trials/);
  });
});

describe('Newcombe hybrid score interval for a difference (Newcombe 1998, Stat Med 17:873)', () => {
  it('reproduces the worked example 56/70 − 48/80 → [0.0524, 0.3339] (method 10)', () => {
    // Table II of the paper, example (a), method 10 — values recalled from memory.
    const d = differenceInterval(56, 70, 48, 80);
    expect(d.difference).toBeCloseTo(0.2, 12);
    expect(d.lower).toBeCloseTo(0.0524, 4);
    expect(d.upper).toBeCloseTo(0.3339, 4);
  });

  it('includes 0 for a small move and excludes it for a large one at n = 10', () => {
    expect(differenceInterval(8, 10, 7, 10).lower).toBeLessThan(0);
    expect(differenceInterval(9, 10, 3, 10).lower).toBeGreaterThan(0);
  });
});
