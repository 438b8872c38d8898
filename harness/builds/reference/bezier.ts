// Cubic Bézier curves in 3-D, control points packed as a Float64Array(12) = P0, P1, P2, P3.
// Two evaluations that must agree: the Bernstein form B(s) = Σ C(3,k)·s^k·(1−s)^(3−k)·P_k and
// de Casteljau's repeated linear interpolation (Farin, Curves and Surfaces for CAGD, ch. 4).
// Bernstein is what the swing uses (fewer operations); de Casteljau is the numerically robust
// reference the tests compare it against.

export const CUBIC_POINTS = 4;

/** Point at parameter s ∈ [0, 1], Bernstein form, written to out[o..o+3). */
export function bezierBernstein(out: Float64Array, o: number, p: Float64Array, s: number): void {
  const t = 1 - s;
  const b0 = t * t * t, b1 = 3 * s * t * t, b2 = 3 * s * s * t, b3 = s * s * s;
  for (let c = 0; c < 3; c++) {
    out[o + c] = b0 * p[c] + b1 * p[3 + c] + b2 * p[6 + c] + b3 * p[9 + c];
  }
}

/** Derivative dB/ds at s, written to out[o..o+3): 3·Σ b_k^(2)(s)·(P_{k+1} − P_k). */
export function bezierDerivative(out: Float64Array, o: number, p: Float64Array, s: number): void {
  const t = 1 - s;
  const d0 = 3 * t * t, d1 = 6 * s * t, d2 = 3 * s * s;
  for (let c = 0; c < 3; c++) {
    out[o + c] = d0 * (p[3 + c] - p[c]) + d1 * (p[6 + c] - p[3 + c]) + d2 * (p[9 + c] - p[6 + c]);
  }
}

/**
 * Point at s by de Casteljau's algorithm, written to out[o..o+3). `scratch` (length ≥ 12) holds
 * the intermediate points so the call allocates nothing.
 */
export function bezierDeCasteljau(out: Float64Array, o: number, p: Float64Array, s: number, scratch: Float64Array): void {
  for (let i = 0; i < 12; i++) scratch[i] = p[i];
  for (let level = 3; level > 0; level--) {
    for (let k = 0; k < level; k++) {
      for (let c = 0; c < 3; c++) {
        scratch[3 * k + c] = (1 - s) * scratch[3 * k + c] + s * scratch[3 * (k + 1) + c];
      }
    }
  }
  out[o] = scratch[0];
  out[o + 1] = scratch[1];
  out[o + 2] = scratch[2];
}

/**
 * Control points of a swing arc from `start` to `end` (each 3 values at so/eo) whose height at
 * mid-swing is `apex_m` above the mean of the endpoint heights. With P1 = P0 + h·ẑ and
 * P2 = P3 + h·ẑ the height is z(s) = z0(1−s)²(1+2s) + z3·s²(3−2s) + 3h·s(1−s), so z(½) =
 * (z0 + z3)/2 + ¾h; h = (4/3)·apex gives the configured apex. The horizontal path is
 * P0 + (P3 − P0)·s²(3 − 2s): zero velocity at lift-off and touchdown.
 */
export function swingControlPoints(
  out: Float64Array,
  start: Float64Array,
  so: number,
  end: Float64Array,
  eo: number,
  apex_m: number,
): Float64Array {
  const lift = (4 / 3) * apex_m;
  for (let c = 0; c < 3; c++) {
    out[c] = start[so + c];
    out[3 + c] = start[so + c];
    out[6 + c] = end[eo + c];
    out[9 + c] = end[eo + c];
  }
  out[5] += lift;
  out[8] += lift;
  return out;
}
