// Force distribution: the ground forces f_i on the stance feet whose resultant wrench about the
// trunk's centre of mass equals the wanted wrench w = (F, τ):
//   A·f = w,  A = [ I  …  I ; [r_1]× … [r_n]× ],  r_i = the moment arm of leg i.
// The plant applies each leg's force to the trunk at the hip, so r_i is the hip (not the foot)
// relative to the centre of mass. We take the minimum-norm, Tikhonov-regularised solution written
// in the 6-D dual form f = Aᵀ·(A·Aᵀ + Λ)⁻¹·w (the push-through identity turns the 3n×3n normal
// equations into a fixed 6×6 SPD solve, factorised by Cholesky). Λ = diag(λ_F·I, λ_τ·I) keeps the
// solve defined for a two-foot stance, where A has rank 5 (no moment about the support diagonal);
// λ_τ ≫ λ_F makes the solution give up that moment rather than the force. A few passes of
// iterative refinement (Wilkinson; Golub & Van Loan §3.5.3) then remove the bias the
// regularisation puts on any achievable component, so a full-rank stance reproduces w to
// rounding while the unachievable moment stays the Λ⁻¹-weighted least-squares compromise.

import { choleskyInPlace6, choleskySolve6ReciprocalMany } from './linalg.js';

/** Right-hand sides solved side by side by solveMany (the controller has 1 + 3). */
const BATCH = 4;

export class ForceDistributor {
  readonly legCount: number;
  forceRegularisation: number;
  momentRegularisation_m2: number;
  refinementSteps: number;
  /** Moment arms (3 per leg, world frame) and stance mask captured by prepare(). */
  readonly arms: Float64Array;
  readonly stance: Uint8Array;
  stanceCount = 0;
  /** The stance legs in ascending order (the first stanceCount entries), for branch-free loops. */
  private readonly stanceLegs: Int32Array;
  private readonly factor = new Float64Array(36);
  private readonly inverseDiagonal = new Float64Array(6);
  private readonly duals = new Float64Array(6 * BATCH);
  private readonly residuals = new Float64Array(6 * BATCH);

  constructor(legCount: number, forceRegularisation: number, momentRegularisation_m2: number, refinementSteps: number) {
    this.legCount = legCount;
    this.forceRegularisation = forceRegularisation;
    this.momentRegularisation_m2 = momentRegularisation_m2;
    this.refinementSteps = refinementSteps;
    this.arms = new Float64Array(3 * legCount);
    this.stance = new Uint8Array(legCount);
    this.stanceLegs = new Int32Array(legCount);
  }

  /** Builds and factorises A·Aᵀ + Λ for this stance set. Returns false if the factorisation failed. */
  prepare(stance: Uint8Array, arms: Float64Array): boolean {
    let n = 0, sx = 0, sy = 0, sz = 0, xx = 0, yy = 0, zz = 0, xy = 0, xz = 0, yz = 0;
    const ownStance = this.stance, ownArms = this.arms, stanceLegs = this.stanceLegs;
    for (let i = 0; i < this.legCount; i++) {
      ownStance[i] = stance[i];
      const x = arms[3 * i], y = arms[3 * i + 1], z = arms[3 * i + 2];
      ownArms[3 * i] = x;
      ownArms[3 * i + 1] = y;
      ownArms[3 * i + 2] = z;
      if (stance[i] === 0) continue;
      stanceLegs[n] = i;
      n++;
      sx += x; sy += y; sz += z;
      xx += x * x; yy += y * y; zz += z * z;
      xy += x * y; xz += x * z; yz += y * z;
    }
    this.stanceCount = n;
    if (n === 0) return true;
    const a = this.factor;
    const lf = this.forceRegularisation, lt = this.momentRegularisation_m2;
    // Top-left n·I; off-diagonal blocks ±[Σr]×; bottom-right Σ(|r|²I − r·rᵀ).
    a[0] = n + lf; a[1] = 0; a[2] = 0; a[3] = 0; a[4] = sz; a[5] = -sy;
    a[6] = 0; a[7] = n + lf; a[8] = 0; a[9] = -sz; a[10] = 0; a[11] = sx;
    a[12] = 0; a[13] = 0; a[14] = n + lf; a[15] = sy; a[16] = -sx; a[17] = 0;
    a[18] = 0; a[19] = -sz; a[20] = sy; a[21] = yy + zz + lt; a[22] = -xy; a[23] = -xz;
    a[24] = sz; a[25] = 0; a[26] = -sx; a[27] = -xy; a[28] = xx + zz + lt; a[29] = -yz;
    a[30] = -sy; a[31] = sx; a[32] = 0; a[33] = -xz; a[34] = -yz; a[35] = xx + yy + lt;
    if (!choleskyInPlace6(a)) return false;
    for (let k = 0; k < 6; k++) this.inverseDiagonal[k] = 1 / a[7 * k];
    return true;
  }

  /** Forces (3 per leg, world; zero for swing legs) reproducing `wrench` (F, τ) as well as possible. */
  solve(forces: Float64Array, wrench: Float64Array): Float64Array {
    forces.fill(0);
    return this.solveMany(forces, wrench, 1);
  }

  /**
   * solve() for `count` wrenches packed 6 apiece in `wrenches` (from index 0), writing each
   * one's forces (3 per leg) packed in `forces`: the factor is shared and nothing is copied.
   * Per right-hand side: y = (A·Aᵀ + Λ)⁻¹·w, f = Aᵀ·y, then refinementSteps passes of
   * y += (A·Aᵀ + Λ)⁻¹·(w − A·f), f = Aᵀ·y.
   */
  solveMany(forces: Float64Array, wrenches: Float64Array, count: number): Float64Array {
    const legs = this.legCount, stride = 3 * legs;
    if (this.stanceCount === 0) {
      forces.fill(0, 0, count * stride);
      return forces;
    }
    for (let first = 0; first < count; first += BATCH) {
      this.solveBatch(forces, wrenches, first, count - first < BATCH ? count - first : BATCH);
    }
    return forces;
  }

  /**
   * Right-hand sides first … first + size − 1, phase by phase: the solves of different
   * right-hand sides are independent, so issuing them back to back lets the processor overlap
   * their (latency-bound) dependency chains, where one right-hand side after the other
   * serialised them. Loops run over the stance legs only (swing legs' forces are zeroed once);
   * each refinement's correction is added to the dual as it is solved (the same sum y + δy).
   */
  private solveBatch(forces: Float64Array, wrenches: Float64Array, first: number, size: number): void {
    const stride = 3 * this.legCount, feet = this.stanceCount, stanceLegs = this.stanceLegs;
    const factor = this.factor, inverse = this.inverseDiagonal, dual = this.duals, residual = this.residuals;
    const arms = this.arms, steps = this.refinementSteps;
    choleskySolve6ReciprocalMany(dual, 0, factor, inverse, wrenches, 6 * first, size, false);
    for (let r = 0; r < size; r++) {
      this.zeroSwingForces(forces, (first + r) * stride);
      this.applyTransposeAt(forces, (first + r) * stride, dual, 6 * r);
    }
    for (let pass = 0; pass < steps; pass++) {
      for (let r = 0; r < size; r++) {
        const fo = (first + r) * stride, wo = 6 * (first + r), ro = 6 * r;
        let fx = 0, fy = 0, fz = 0, tx = 0, ty = 0, tz = 0;
        for (let a = 0; a < feet; a++) {
          const o = 3 * stanceLegs[a], p = fo + o;
          const x = arms[o], y = arms[o + 1], z = arms[o + 2];
          const px = forces[p], py = forces[p + 1], pz = forces[p + 2];
          fx += px; fy += py; fz += pz;
          tx += y * pz - z * py;
          ty += z * px - x * pz;
          tz += x * py - y * px;
        }
        residual[ro] = wrenches[wo] - fx;
        residual[ro + 1] = wrenches[wo + 1] - fy;
        residual[ro + 2] = wrenches[wo + 2] - fz;
        residual[ro + 3] = wrenches[wo + 3] - tx;
        residual[ro + 4] = wrenches[wo + 4] - ty;
        residual[ro + 5] = wrenches[wo + 5] - tz;
      }
      choleskySolve6ReciprocalMany(dual, 0, factor, inverse, residual, 0, size, true);
      for (let r = 0; r < size; r++) this.applyTransposeAt(forces, (first + r) * stride, dual, 6 * r);
    }
  }

  /** Zero forces for the swing legs of the right-hand side whose forces start at forces[fo]. */
  private zeroSwingForces(forces: Float64Array, fo: number): void {
    const stance = this.stance;
    for (let i = 0; i < this.legCount; i++) {
      if (stance[i] !== 0) continue;
      const p = fo + 3 * i;
      forces[p] = 0; forces[p + 1] = 0; forces[p + 2] = 0;
    }
  }

  /** f_i = y_F + y_τ × r_i for the stance legs (this is Aᵀ·y), y from y[yo], f written from forces[fo] on. */
  private applyTransposeAt(forces: Float64Array, fo: number, y: Float64Array, yo: number): void {
    const fx = y[yo], fy = y[yo + 1], fz = y[yo + 2], tx = y[yo + 3], ty = y[yo + 4], tz = y[yo + 5];
    const arms = this.arms, stanceLegs = this.stanceLegs, feet = this.stanceCount;
    for (let a = 0; a < feet; a++) {
      const o = 3 * stanceLegs[a], p = fo + o;
      const x = arms[o], yy = arms[o + 1], z = arms[o + 2];
      forces[p] = fx + (ty * z - tz * yy);
      forces[p + 1] = fy + (tz * x - tx * z);
      forces[p + 2] = fz + (tx * yy - ty * x);
    }
  }
}

/** Resultant (Σ f_i, Σ r_i × f_i) of the stance legs' forces, written to out (6). */
export function wrenchOf(out: Float64Array, forces: Float64Array, arms: Float64Array, stance: Uint8Array, legCount: number): Float64Array {
  let fx = 0, fy = 0, fz = 0, tx = 0, ty = 0, tz = 0;
  for (let i = 0; i < legCount; i++) {
    if (stance[i] === 0) continue;
    const o = 3 * i;
    const x = arms[o], y = arms[o + 1], z = arms[o + 2];
    const px = forces[o], py = forces[o + 1], pz = forces[o + 2];
    fx += px; fy += py; fz += pz;
    tx += y * pz - z * py;
    ty += z * px - x * pz;
    tz += x * py - y * px;
  }
  out[0] = fx; out[1] = fy; out[2] = fz; out[3] = tx; out[4] = ty; out[5] = tz;
  return out;
}
