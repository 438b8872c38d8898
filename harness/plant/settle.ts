// The settled start: the ground loads of a robot standing still, solved statically before t = 0.
//
// Why a static solve rather than a settle phase run before t = 0: the plant's contact law is
// algebraic at rest (Hunt–Crossley at δ̇ = 0 is k·δⁿ, and the stick/slide solve has no internal
// state), so the state "every foot loaded to its share, nothing moving" can be written down
// directly. A settle phase would need the build to run (its legs hold the trunk), would make the
// start depend on the build's transient, and would cost run time; the static solve depends on the
// robot, the ground and gravity only, and is exact where statics is (a block on an incline).

/**
 * Forces at n support points xᵢ that hold a rigid body of weight `weight_N` (the force gravity
 * puts on it) at rest: Σ fᵢ = −weight and Σ (xᵢ − c) × fᵢ = 0 about its centre of mass c.
 * With more than six unknowns this is statically indeterminate; the answer is the minimum-norm one, fᵢ = Aᵢᵀ (A Aᵀ)⁻¹ b (the Moore–Penrose solution of A f = b).
 * A tiny regularisation on the moment rows lets one or two feet (A of rank < 6) give up the moment
 * they cannot carry instead of failing. Allocates; called once per plant.
 */
export function staticSupportForces(points_m: Float64Array, centre_m: ArrayLike<number>, weight_N: ArrayLike<number>): Float64Array {
  const n = points_m.length / 3;
  const A: number[][] = Array.from({ length: 6 }, () => new Array<number>(3 * n).fill(0));
  for (let i = 0; i < n; i++) {
    const rx = points_m[3 * i] - centre_m[0];
    const ry = points_m[3 * i + 1] - centre_m[1];
    const rz = points_m[3 * i + 2] - centre_m[2];
    for (let a = 0; a < 3; a++) A[a][3 * i + a] = 1;
    // Rows of [r]× so that A[3..5]·f = r × f.
    A[3][3 * i + 1] = -rz; A[3][3 * i + 2] = ry;
    A[4][3 * i] = rz; A[4][3 * i + 2] = -rx;
    A[5][3 * i] = -ry; A[5][3 * i + 1] = rx;
  }
  const M: number[][] = A.map((ra) => A.map((rb) => ra.reduce((s, x, j) => s + x * rb[j], 0)));
  const scale = Math.max(M[3][3], M[4][4], M[5][5], 1e-300);
  for (let r = 3; r < 6; r++) M[r][r] += 1e-9 * scale;
  const y = solveDense([-weight_N[0], -weight_N[1], -weight_N[2], 0, 0, 0], M);
  const out = new Float64Array(3 * n);
  for (let j = 0; j < 3 * n; j++) {
    let s = 0;
    for (let r = 0; r < 6; r++) s += A[r][j] * y[r];
    out[j] = s;
  }
  return out;
}

/** Gaussian elimination with partial pivoting (M is SPD here, so pivoting is only a safeguard). */
function solveDense(b: number[], M: number[][]): number[] {
  const n = b.length;
  const a = M.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r][c]) > Math.abs(a[p][c])) p = r;
    [a[c], a[p]] = [a[p], a[c]];
    for (let r = c + 1; r < n; r++) {
      const f = a[r][c] / a[c][c];
      for (let k = c; k <= n; k++) a[r][k] -= f * a[c][k];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = a[r][n];
    for (let k = r + 1; k < n; k++) s -= a[r][k] * x[k];
    x[r] = s / a[r][r];
  }
  return x;
}

/** Penetration at which the contact law k·δⁿ carries `load_N` at rest. */
export function restingDepth_m(stiffness: number, exponent: number, load_N: number): number {
  return load_N > 0 ? (load_N / stiffness) ** (1 / exponent) : 0;
}
