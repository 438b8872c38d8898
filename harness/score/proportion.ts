// Intervals for success rates: the Wilson score interval for one proportion (Wilson 1927, JASA
// 22:209) and Newcombe's hybrid score interval for a difference of two (Newcombe 1998, Statistics
// in Medicine 17:873, method 10), built from the two Wilson intervals. Both keep sensible coverage
// at the small sample counts and 0 %/100 % rates a scenario family gives, where the textbook
// Wald interval p ± z·√(p(1−p)/n) collapses to a point.

export interface Interval {
  lower: number;
  upper: number;
}

/**
 * Standard normal quantile Φ⁻¹(p), by Acklam's rational approximation (relative error below
 * 1.2·10⁻⁹ over (0, 1); coefficients as published by P. J. Acklam, 2003). Checked against
 * simple-statistics' probit in test/score/proportion.test.ts.
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) {
    if (p === 0) return -Infinity;
    if (p === 1) return Infinity;
    throw new RangeError(`normalQuantile: p = ${p} is not a probability in [0, 1]`);
  }
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const low = 0.02425;
  if (p < low) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  if (p > 1 - low) {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    return -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  const q = p - 0.5;
  const r = q * q;
  return ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
}

/** z of a two-sided interval at `confidence` (0.95 → 1.95996…). */
export function twoSidedZ(confidence: number): number {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence ${confidence} is not in (0, 1)`);
  return normalQuantile(1 - (1 - confidence) / 2);
}

/**
 * Wilson score interval for `successes` of `trials` at `confidence`:
 *   centre = (p̂ + z²/2n) / (1 + z²/n),  half-width = z/(1 + z²/n) · √(p̂(1−p̂)/n + z²/4n²).
 * 8 of 10 at 95 % gives [0.490, 0.943].
 */
export function wilsonInterval(successes: number, trials: number, confidence = 0.95): Interval {
  if (!Number.isInteger(trials) || trials < 1) throw new RangeError(`wilsonInterval: ${trials} trials (expected a whole number ≥ 1)`);
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError(`wilsonInterval: ${successes} successes of ${trials} trials (expected a whole number from 0 to ${trials})`);
  }
  const z = twoSidedZ(confidence);
  const n = trials;
  const p = successes / n;
  const z2n = (z * z) / n;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  // At 0 and n successes the formula's end is 0 or 1 up to rounding; pin it there.
  return {
    lower: successes === 0 ? 0 : Math.max(0, centre - half),
    upper: successes === trials ? 1 : Math.min(1, centre + half),
  };
}

/**
 * Newcombe's hybrid score interval (method 10) for p₁ − p₂ from the Wilson intervals (l₁, u₁) and
 * (l₂, u₂): [d − √((p₁−l₁)² + (u₂−p₂)²),  d + √((u₁−p₁)² + (p₂−l₂)²)], d = p₁ − p₂.
 */
export function differenceInterval(
  successes1: number,
  trials1: number,
  successes2: number,
  trials2: number,
  confidence = 0.95,
): Interval & { difference: number } {
  const p1 = successes1 / trials1;
  const p2 = successes2 / trials2;
  const w1 = wilsonInterval(successes1, trials1, confidence);
  const w2 = wilsonInterval(successes2, trials2, confidence);
  const d = p1 - p2;
  return {
    difference: d,
    lower: d - Math.sqrt((p1 - w1.lower) ** 2 + (w2.upper - p2) ** 2),
    upper: d + Math.sqrt((w1.upper - p1) ** 2 + (p2 - w2.lower) ** 2),
  };
}
