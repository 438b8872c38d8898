// QP force distribution with the friction pyramid and the normal band as hard constraints,
// solved by the npm package `quadprog` (Goldfarb & Idnani 1983, dual active set).
//
//   minimise   (f − f_LS)ᵀ·H·(f − f_LS),   H = Aᵀ·W·A + λ·I,  W = diag(I, I/L²)
//   subject to ±f_x ≤ μ'·f_z, ±f_y ≤ μ'·f_z, f_min ≤ f_z ≤ f_max   for every stance foot,
// where f_LS is the least-squares distribution (distribution.ts) and A the stance wrench map.
// Up to a constant the objective is the W-weighted wrench error ‖A·f − A·f_LS‖²_W plus a small
// Tikhonov term, so the QP returns f_LS exactly when it is feasible and otherwise the forces
// whose wrench is closest to the wanted one. L (the yaw length) makes moments and forces
// commensurable. The solver allocates its own work arrays on every call (a library; noted in
// docs/reference-controllers.md); the matrices handed to it are preallocated per stance count.

import quadprog from 'quadprog';

interface Problem {
  n: number;
  q: number;
  dmat: number[][];
  dvec: number[];
  amat: number[][];
  bvec: number[];
  flags: number[];
}

function makeProblem(feet: number): Problem {
  const n = 3 * feet, q = 6 * feet;
  const dmat: number[][] = [[]];
  const amat: number[][] = [[]];
  for (let i = 1; i <= n; i++) {
    dmat.push(new Array<number>(n + 1).fill(0));
    amat.push(new Array<number>(q + 1).fill(0));
  }
  return {
    n,
    q,
    dmat,
    dvec: new Array<number>(n + 1).fill(0),
    amat,
    bvec: new Array<number>(q + 1).fill(0),
    flags: [0, 0],
  };
}

export class QuadraticDistributor {
  readonly legCount: number;
  readonly momentWeight_per_m2: number;
  readonly regularisation: number;
  /** Solver iterations and the number of active constraints of the last solve (telemetry). */
  activeConstraints = 0;
  failures = 0;
  private readonly problems: Problem[] = [];
  private readonly order: Int32Array;

  constructor(legCount: number, yawLength_m: number, regularisation = 1e-3) {
    this.legCount = legCount;
    this.momentWeight_per_m2 = 1 / (yawLength_m * yawLength_m);
    this.regularisation = regularisation;
    this.problems.push(makeProblem(1));
    for (let feet = 1; feet <= legCount; feet++) this.problems[feet] = makeProblem(feet);
    this.order = new Int32Array(legCount);
  }

  /** Whether the stance feet's forces meet all six constraints each (slack ≥ 0, as the solver tests). */
  private feasible(forces: Float64Array, feet: number, pyramid: Float64Array, min_N: number, max_N: number): boolean {
    for (let a = 0; a < feet; a++) {
      const leg = this.order[a], ia = 3 * leg, mu = pyramid[leg];
      const fx = forces[ia], fy = forces[ia + 1], fz = forces[ia + 2];
      const cone = mu * fz;
      if (!(cone - fx >= 0 && cone + fx >= 0 && cone - fy >= 0 && cone + fy >= 0)) return false;
      if (!(fz - min_N >= 0 && max_N - fz >= 0)) return false;
    }
    return true;
  }

  /**
   * Replaces `forces` (the least-squares solution on entry) by the QP solution. Returns false
   * (forces unchanged) when the solver reports a failure. pyramid: μ' per leg; band =
   * (trust, margin, f_min, f_max) as in the controller.
   */
  solve(forces: Float64Array, stance: Uint8Array, arms: Float64Array, pyramid: Float64Array, band: Float64Array): boolean {
    const min_N = band[2], max_N = band[3];
    let feet = 0;
    for (let i = 0; i < this.legCount; i++) if (stance[i] !== 0) this.order[feet++] = i;
    this.activeConstraints = 0;
    if (feet === 0) return true;
    // H is positive definite, so when f_LS already satisfies every constraint it is the QP's
    // unique minimiser (objective 0) and the solver, which starts from the unconstrained
    // minimum, would return it with no active constraint (up to the rounding of its own
    // factorisation). Skipping the call then saves the solver's set-up and its allocations.
    if (this.feasible(forces, feet, pyramid, min_N, max_N)) return true;
    const problem = this.problems[feet];
    const { dmat, dvec, amat, bvec, flags } = problem;
    const w = this.momentWeight_per_m2;
    // H block (a, b) = I + w·((r_a·r_b)·I − r_b·r_aᵀ) + λ·δ_ab·I.
    for (let a = 0; a < feet; a++) {
      const ia = 3 * this.order[a];
      for (let b = 0; b < feet; b++) {
        const ib = 3 * this.order[b];
        const dot = arms[ia] * arms[ib] + arms[ia + 1] * arms[ib + 1] + arms[ia + 2] * arms[ib + 2];
        for (let p = 0; p < 3; p++) {
          for (let c = 0; c < 3; c++) {
            let h = w * ((p === c ? dot : 0) - arms[ib + p] * arms[ia + c]);
            if (p === c) h += 1 + (a === b ? this.regularisation : 0);
            dmat[3 * a + p + 1][3 * b + c + 1] = h;
          }
        }
      }
    }
    // d = H·f_LS.
    for (let r = 1; r <= problem.n; r++) {
      let s = 0;
      for (let b = 0; b < feet; b++) {
        const ib = 3 * this.order[b];
        s += dmat[r][3 * b + 1] * forces[ib] + dmat[r][3 * b + 2] * forces[ib + 1] + dmat[r][3 * b + 3] * forces[ib + 2];
      }
      dvec[r] = s;
    }
    // Constraints Aᵀ·f ≥ b0, six per foot.
    for (let r = 1; r <= problem.n; r++) for (let c = 1; c <= problem.q; c++) amat[r][c] = 0;
    for (let a = 0; a < feet; a++) {
      const mu = pyramid[this.order[a]];
      const x = 3 * a + 1, y = x + 1, z = x + 2, k = 6 * a;
      amat[x][k + 1] = -1; amat[z][k + 1] = mu; bvec[k + 1] = 0;
      amat[x][k + 2] = 1; amat[z][k + 2] = mu; bvec[k + 2] = 0;
      amat[y][k + 3] = -1; amat[z][k + 3] = mu; bvec[k + 3] = 0;
      amat[y][k + 4] = 1; amat[z][k + 4] = mu; bvec[k + 4] = 0;
      amat[z][k + 5] = 1; bvec[k + 5] = min_N;
      amat[z][k + 6] = -1; bvec[k + 6] = -max_N;
    }
    flags[0] = 0;
    flags[1] = 0;
    const result = quadprog.solveQP(dmat, dvec, amat, bvec, 0, flags);
    if (result.message !== '' && result.message !== undefined) {
      this.failures++;
      return false;
    }
    for (let a = 0; a < feet; a++) {
      const ia = 3 * this.order[a];
      forces[ia] = result.solution[3 * a + 1];
      forces[ia + 1] = result.solution[3 * a + 2];
      forces[ia + 2] = result.solution[3 * a + 3];
    }
    let active = 0;
    for (let k = 1; k < result.iact.length; k++) if (result.iact[k] > 0) active++;
    this.activeConstraints = active;
    return true;
  }
}
