// Fixed-size dense linear algebra on row-major Float64Arrays, written out so nothing allocates.
// The distribution solves a 6×6 symmetric positive-definite system every tick; Cholesky is the
// textbook choice for SPD matrices (Golub & Van Loan, Matrix Computations, §4.2).

/**
 * In-place Cholesky factorisation A = L·Lᵀ of the leading n×n block of a row-major matrix with
 * row stride n. The lower triangle is overwritten by L (upper triangle left untouched).
 * Returns false when a pivot is not positive (A not positive definite to working precision).
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let diagonal = a[j * n + j];
    for (let k = 0; k < j; k++) diagonal -= a[j * n + k] * a[j * n + k];
    if (!(diagonal > 0)) return false;
    const pivot = Math.sqrt(diagonal);
    a[j * n + j] = pivot;
    for (let i = j + 1; i < n; i++) {
      let sum = a[i * n + j];
      for (let k = 0; k < j; k++) sum -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = sum / pivot;
    }
  }
  return true;
}

/**
 * choleskyInPlace for n = 6, written out: the same operations in the same order (so the same
 * bits, and on a failed pivot the same partly overwritten matrix), with L's entries kept in
 * locals instead of read back (profiled: the loop version's index arithmetic and bounds checks
 * were most of the distribution's set-up).
 */
export function choleskyInPlace6(a: Float64Array): boolean {
  const d0 = a[0];
  if (!(d0 > 0)) return false;
  const l00 = Math.sqrt(d0);
  a[0] = l00;
  const l10 = a[6] / l00;
  a[6] = l10;
  const l20 = a[12] / l00;
  a[12] = l20;
  const l30 = a[18] / l00;
  a[18] = l30;
  const l40 = a[24] / l00;
  a[24] = l40;
  const l50 = a[30] / l00;
  a[30] = l50;
  const d1 = a[7] - l10 * l10;
  if (!(d1 > 0)) return false;
  const l11 = Math.sqrt(d1);
  a[7] = l11;
  const l21 = (a[13] - l20 * l10) / l11;
  a[13] = l21;
  const l31 = (a[19] - l30 * l10) / l11;
  a[19] = l31;
  const l41 = (a[25] - l40 * l10) / l11;
  a[25] = l41;
  const l51 = (a[31] - l50 * l10) / l11;
  a[31] = l51;
  const d2 = a[14] - l20 * l20 - l21 * l21;
  if (!(d2 > 0)) return false;
  const l22 = Math.sqrt(d2);
  a[14] = l22;
  const l32 = (a[20] - l30 * l20 - l31 * l21) / l22;
  a[20] = l32;
  const l42 = (a[26] - l40 * l20 - l41 * l21) / l22;
  a[26] = l42;
  const l52 = (a[32] - l50 * l20 - l51 * l21) / l22;
  a[32] = l52;
  const d3 = a[21] - l30 * l30 - l31 * l31 - l32 * l32;
  if (!(d3 > 0)) return false;
  const l33 = Math.sqrt(d3);
  a[21] = l33;
  const l43 = (a[27] - l40 * l30 - l41 * l31 - l42 * l32) / l33;
  a[27] = l43;
  const l53 = (a[33] - l50 * l30 - l51 * l31 - l52 * l32) / l33;
  a[33] = l53;
  const d4 = a[28] - l40 * l40 - l41 * l41 - l42 * l42 - l43 * l43;
  if (!(d4 > 0)) return false;
  const l44 = Math.sqrt(d4);
  a[28] = l44;
  const l54 = (a[34] - l50 * l40 - l51 * l41 - l52 * l42 - l53 * l43) / l44;
  a[34] = l54;
  const d5 = a[35] - l50 * l50 - l51 * l51 - l52 * l52 - l53 * l53 - l54 * l54;
  if (!(d5 > 0)) return false;
  const l55 = Math.sqrt(d5);
  a[35] = l55;
  return true;
}

/** Solves L·Lᵀ·x = b with the factor from choleskyInPlace; x may alias b. */
export function choleskySolve(x: Float64Array, l: Float64Array, b: Float64Array, n: number): Float64Array {
  for (let i = 0; i < n; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * x[k];
    x[i] = sum / l[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let sum = x[i];
    for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * x[k];
    x[i] = sum / l[i * n + i];
  }
  return x;
}

/**
 * choleskySolve for n = 6, written out (the loop version's bounds checks and index arithmetic
 * were most of its cost). Same operations in the same order as choleskySolve, so the same bits.
 * x may alias b. The force distribution uses choleskySolve6ReciprocalMany below.
 */
export function choleskySolve6(x: Float64Array, l: Float64Array, b: Float64Array): Float64Array {
  const y0 = b[0] / l[0];
  const y1 = (b[1] - l[6] * y0) / l[7];
  const y2 = (b[2] - l[12] * y0 - l[13] * y1) / l[14];
  const y3 = (b[3] - l[18] * y0 - l[19] * y1 - l[20] * y2) / l[21];
  const y4 = (b[4] - l[24] * y0 - l[25] * y1 - l[26] * y2 - l[27] * y3) / l[28];
  const y5 = (b[5] - l[30] * y0 - l[31] * y1 - l[32] * y2 - l[33] * y3 - l[34] * y4) / l[35];
  const x5 = y5 / l[35];
  const x4 = (y4 - l[34] * x5) / l[28];
  const x3 = (y3 - l[27] * x4 - l[33] * x5) / l[21];
  const x2 = (y2 - l[20] * x3 - l[26] * x4 - l[32] * x5) / l[14];
  const x1 = (y1 - l[13] * x2 - l[19] * x3 - l[25] * x4 - l[31] * x5) / l[7];
  const x0 = (y0 - l[6] * x1 - l[12] * x2 - l[18] * x3 - l[24] * x4 - l[30] * x5) / l[0];
  x[0] = x0; x[1] = x1; x[2] = x2; x[3] = x3; x[4] = x4; x[5] = x5;
  return x;
}

/** Rotation matrix (row-major 3×3, trunk → world) from a unit quaternion: the plant's helper. */
export { matrixFromQuaternion } from '../../plant/rotation.js';

/** out[o..o+3) = R · v[vo..vo+3). out must not alias v. */
export function rotate(out: Float64Array, o: number, r: Float64Array, v: Float64Array, vo: number): void {
  const x = v[vo], y = v[vo + 1], z = v[vo + 2];
  out[o] = r[0] * x + r[1] * y + r[2] * z;
  out[o + 1] = r[3] * x + r[4] * y + r[5] * z;
  out[o + 2] = r[6] * x + r[7] * y + r[8] * z;
}

/** out[o..o+3) = Rᵀ · v[vo..vo+3). out must not alias v. */
export function rotateTransposed(out: Float64Array, o: number, r: Float64Array, v: Float64Array, vo: number): void {
  const x = v[vo], y = v[vo + 1], z = v[vo + 2];
  out[o] = r[0] * x + r[3] * y + r[6] * z;
  out[o + 1] = r[1] * x + r[4] * y + r[7] * z;
  out[o + 2] = r[2] * x + r[5] * y + r[8] * z;
}

/**
 * choleskySolve6 for `count` right-hand sides packed 6 apiece, b read from b[bo..) and x written
 * to x[xo..) (the distribution's wrenches share one factor without copies), with the reciprocals
 * of L's diagonal (inverse[k] = 1/L_kk) multiplied in instead of divided by: a division is
 * several times the latency of a multiplication, and the twelve of them sit on the solve's
 * dependency chain. Differs from the divided form only by rounding (one extra rounding per step).
 * The factor and its reciprocals are read once for all right-hand sides (profiled: re-reading
 * them per right-hand side was a few per cent of a governed tick). accumulate: x += the solution
 * (an iterative refinement's correction) instead of x = it; x must then not alias b.
 */
export function choleskySolve6ReciprocalMany(
  x: Float64Array, xo: number, l: Float64Array, inverse: Float64Array, b: Float64Array, bo: number, count: number,
  accumulate: boolean,
): void {
  const d0 = inverse[0], d1 = inverse[1], d2 = inverse[2], d3 = inverse[3], d4 = inverse[4], d5 = inverse[5];
  const l6 = l[6], l12 = l[12], l13 = l[13], l18 = l[18], l19 = l[19], l20 = l[20];
  const l24 = l[24], l25 = l[25], l26 = l[26], l27 = l[27];
  const l30 = l[30], l31 = l[31], l32 = l[32], l33 = l[33], l34 = l[34];
  for (let r = 0; r < count; r++) {
    const i = bo + 6 * r, o = xo + 6 * r;
    const y0 = b[i] * d0;
    const y1 = (b[i + 1] - l6 * y0) * d1;
    const y2 = (b[i + 2] - l12 * y0 - l13 * y1) * d2;
    const y3 = (b[i + 3] - l18 * y0 - l19 * y1 - l20 * y2) * d3;
    const y4 = (b[i + 4] - l24 * y0 - l25 * y1 - l26 * y2 - l27 * y3) * d4;
    const y5 = (b[i + 5] - l30 * y0 - l31 * y1 - l32 * y2 - l33 * y3 - l34 * y4) * d5;
    const x5 = y5 * d5;
    const x4 = (y4 - l34 * x5) * d4;
    const x3 = (y3 - l27 * x4 - l33 * x5) * d3;
    const x2 = (y2 - l20 * x3 - l26 * x4 - l32 * x5) * d2;
    const x1 = (y1 - l13 * x2 - l19 * x3 - l25 * x4 - l31 * x5) * d1;
    const x0 = (y0 - l6 * x1 - l12 * x2 - l18 * x3 - l24 * x4 - l30 * x5) * d0;
    if (accumulate) {
      x[o] += x0; x[o + 1] += x1; x[o + 2] += x2; x[o + 3] += x3; x[o + 4] += x4; x[o + 5] += x5;
    } else {
      x[o] = x0; x[o + 1] = x1; x[o + 2] = x2; x[o + 3] = x3; x[o + 4] = x4; x[o + 5] = x5;
    }
  }
}
