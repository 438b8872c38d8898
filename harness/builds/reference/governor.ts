// The trunk's reference governor: the generic ERG (erg.ts) applied to the applied horizontal
// velocity and yaw-rate reference v = (v_x, v_y, ψ̇) the trunk PD tracks.
//
// Error state z = (e_px, e_vx, e_py, e_vy, e_ψ, e_ω) with e = actual − reference; each axis obeys
// ë = −k_p·e − k_d·ė under the PD, so P = blockdiag(P_x, P_y, P_ψ) from the 2×2 Lyapunov equation
// (Q = diag(k_p, 1) per axis). Moving v by δv moves the velocity errors by −δv (the jump S).
//
// Constraints, per stance foot i, on its wanted ground force f_i = f0_i + Σ_j G_ij·u_j (the
// distribution is linear, u = −K·z the governed accelerations, f0 the forces at u = 0):
//   four sides of the inner pyramid  ±f_x − μ'·f_z ≤ 0, ±f_y − μ'·f_z ≤ 0,
//   the normal band                   f_min ≤ f_z ≤ f_max,
// each c·f_i ≤ d becomes (−(c·G_i)·K)·z ≤ d − c·f0_i: a hyperplane in error space and, at the
// current state, in reference space (repulsion kind INSTANT). Plus the speed bounds
// |v_x + e_vx| ≤ v_max, |v_y + e_vy| ≤ v_max, |ψ̇ + e_ω| ≤ ψ̇_max (kind STEADY, the textbook case).

import { ExplicitReferenceGovernor, INSTANT, STEADY, pdLyapunov } from './erg.js';

export const GOVERNED_AXES = 3;
export const CONSTRAINTS_PER_FOOT = 6;

export interface TrunkGovernorConfig {
  legCount: number;
  stiffness: ArrayLike<number>; // k_p per axis
  damping: ArrayLike<number>; // k_d per axis
  period_s: number;
  gain: number;
  smoothing: number;
  influence: number;
  margin: number;
  /** Length scaling the yaw rate into m/s for the navigation field. */
  yawLength_m: number;
  maxSpeed_mps: number;
  maxYawRate_radps: number;
}

export class TrunkGovernor {
  readonly erg: ExplicitReferenceGovernor;
  readonly target = new Float64Array(GOVERNED_AXES);
  readonly applied: Float64Array;
  private readonly legCount: number;
  private readonly kp: Float64Array;
  private readonly kd: Float64Array;
  private readonly maxSpeed_mps: number;
  private readonly maxYawRate_radps: number;
  /** c·G_j of the current foot, side s of axis j at [6·j + s]. */
  private readonly sensitivity = new Float64Array(6 * GOVERNED_AXES);

  constructor(config: TrunkGovernorConfig) {
    this.legCount = config.legCount;
    this.kp = Float64Array.from(config.stiffness);
    this.kd = Float64Array.from(config.damping);
    const p = new Float64Array(36);
    const block = new Float64Array(3);
    for (let axis = 0; axis < GOVERNED_AXES; axis++) {
      pdLyapunov(block, this.kp[axis], this.kd[axis], this.kp[axis], 1);
      const a = 2 * axis;
      p[a * 6 + a] = block[0];
      p[a * 6 + a + 1] = block[1];
      p[(a + 1) * 6 + a] = block[1];
      p[(a + 1) * 6 + a + 1] = block[2];
    }
    const jump = new Float64Array(6 * GOVERNED_AXES);
    for (let axis = 0; axis < GOVERNED_AXES; axis++) jump[(2 * axis + 1) * GOVERNED_AXES + axis] = -1;
    this.erg = new ExplicitReferenceGovernor({
      referenceDimension: GOVERNED_AXES,
      stateDimension: 6,
      maxConstraints: CONSTRAINTS_PER_FOOT * config.legCount + 2 * GOVERNED_AXES,
      lyapunov: p,
      jump,
      referenceScale: [1, 1, config.yawLength_m],
      gain: config.gain,
      smoothing: config.smoothing,
      influence: config.influence,
      margin: config.margin,
      period_s: config.period_s,
    });
    this.applied = this.erg.applied;
    // linearise() refreshes the stance constraints itself for this shape: P⁻¹ in three full 2×2
    // blocks, column j of S nonzero in row 2j + 1 only (the velocity error of axis j).
    const sIndex = this.erg.sIndex;
    if (!this.erg.blockPattern || sIndex[0] !== 1 || sIndex[1] !== 3 || sIndex[2] !== 5) {
      throw new Error('trunk governor: P⁻¹ or S lost its block pattern');
    }
    this.maxSpeed_mps = config.maxSpeed_mps;
    this.maxYawRate_radps = config.maxYawRate_radps;
    // The speed bounds do not depend on the state: built (and refreshed) once here, copied into
    // the table each tick after the stance constraints.
    this.speedBounds = new ConstraintBlock(2 * GOVERNED_AXES, this.erg);
    this.writeSpeedBounds(0);
    this.speedBounds.copyFrom(this.erg, 0);
    // Every entry but the speed bounds' is a stance constraint: INSTANT, no reference row.
    this.heldSpeedBound = new Uint8Array(this.erg.maxConstraints);
    for (let k = 0; k < this.erg.maxConstraints; k++) {
      if (k < this.speedBounds.count) this.heldSpeedBound[k] = 1;
      else this.erg.kinds[k] = INSTANT;
    }
  }

  private readonly speedBounds: ConstraintBlock;
  /** Where the speed bounds sit in the table (they follow the stance constraints). */
  private speedBoundsAt = 0;
  /**
   * 1 for the entries a speed bound was copied into since a stance constraint last was: only
   * those need their kind and zero reference row written again (profiled: rewriting them, and
   * copying the unchanged speed bounds, every tick was a third of linearise()).
   */
  private readonly heldSpeedBound: Uint8Array;

  /** Writes the 2·GOVERNED_AXES speed-bound constraints into the table from index k on. */
  private writeSpeedBounds(k: number): number {
    const erg = this.erg;
    for (let axis = 0; axis < GOVERNED_AXES; axis++) {
      const limit = axis === 2 ? this.maxYawRate_radps : this.maxSpeed_mps;
      for (let sign = 1; sign >= -1; sign -= 2) {
        const rowOffset = k * 6;
        for (let a = 0; a < 6; a++) erg.rows[rowOffset + a] = 0;
        erg.rows[rowOffset + 2 * axis + 1] = sign;
        for (let j = 0; j < GOVERNED_AXES; j++) erg.referenceRows[k * GOVERNED_AXES + j] = j === axis ? sign : 0;
        erg.bounds[k] = limit;
        erg.kinds[k] = STEADY;
        erg.refreshConstraint(k);
        k++;
      }
    }
    return k;
  }

  /**
   * Rebuilds the constraint table for this tick's stance set and linearisation.
   * baseForces: f0 (3 per leg); inputForces: G, column j (3 per leg) at [3N·j, 3N·(j+1));
   * pyramid: μ' per leg; band = (trust, margin, f_min, f_max).
   */
  linearise(
    stance: Uint8Array,
    baseForces: Float64Array,
    inputForces: Float64Array,
    pyramid: Float64Array,
    band: Float64Array,
  ): void {
    const minNormal_N = band[2], maxNormal_N = band[3];
    const erg = this.erg, legs = this.legCount, stride = 3 * legs;
    const rows = erg.rows, referenceRows = erg.referenceRows, bounds = erg.bounds, kinds = erg.kinds;
    const kp = this.kp, kd = this.kd, sens = this.sensitivity, heldSpeedBound = this.heldSpeedBound;
    const kp0 = kp[0], kp1 = kp[1], kp2 = kp[2], kd0 = kd[0], kd1 = kd[1], kd2 = kd[2];
    const weights = erg.inverseSqrtDenominator, jumpRows = erg.jumpRows, normals = erg.repulsionNormal;
    const inverseNorms = erg.repulsionInverseNorm;
    // P⁻¹'s three 2×2 blocks and S's one entry per column (checked in the constructor).
    const pv = erg.piValue, sValue = erg.sValue, scale = erg.scale, unit = erg.unitScale;
    const p0 = pv[0], p1 = pv[1], p2 = pv[2], p3 = pv[3], p4 = pv[4], p5 = pv[5];
    const p6 = pv[6], p7 = pv[7], p8 = pv[8], p9 = pv[9], p10 = pv[10], p11 = pv[11];
    const sv0 = sValue[0], sv1 = sValue[1], sv2 = sValue[2];
    const scale0 = scale[0], scale1 = scale[1], scale2 = scale[2];
    const unit0 = unit[0] === 1, unit1 = unit[1] === 1, unit2 = unit[2] === 1;
    let k = 0;
    for (let i = 0; i < legs; i++) {
      if (stance[i] === 0) continue;
      const mu = pyramid[i], minusMu = -mu;
      const o = 3 * i;
      const b0 = baseForces[o], b1 = baseForces[o + 1], b2 = baseForces[o + 2];
      // The six sides c of this foot (see the header), written out with the same products and
      // sums as c·f (zero entries included, so the bits match the generic form): first the
      // bounds d − c·f0, then c·G_j per axis into sens[6·axis + side].
      bounds[k] = 0 - (1 * b0 + 0 * b1 + minusMu * b2);
      bounds[k + 1] = 0 - (-1 * b0 + 0 * b1 + minusMu * b2);
      bounds[k + 2] = 0 - (0 * b0 + 1 * b1 + minusMu * b2);
      bounds[k + 3] = 0 - (0 * b0 + -1 * b1 + minusMu * b2);
      bounds[k + 4] = -minNormal_N - (0 * b0 + 0 * b1 + -1 * b2);
      bounds[k + 5] = maxNormal_N - (0 * b0 + 0 * b1 + 1 * b2);
      for (let axis = 0; axis < GOVERNED_AXES; axis++) {
        const g = axis * stride + o, so = 6 * axis;
        const gx = inputForces[g], gy = inputForces[g + 1], gz = inputForces[g + 2];
        sens[so] = 1 * gx + 0 * gy + minusMu * gz;
        sens[so + 1] = -1 * gx + 0 * gy + minusMu * gz;
        sens[so + 2] = 0 * gx + 1 * gy + minusMu * gz;
        sens[so + 3] = 0 * gx + -1 * gy + minusMu * gz;
        sens[so + 4] = 0 * gx + 0 * gy + -1 * gz;
        sens[so + 5] = 0 * gx + 0 * gy + 1 * gz;
      }
      for (let side = 0; side < CONSTRAINTS_PER_FOOT; side++) {
        const rowOffset = k * 6, mo = k * GOVERNED_AXES;
        const sx = sens[side], sy = sens[6 + side], sw = sens[12 + side];
        const c0 = -sx * kp0, c1 = -sx * kd0, c2 = -sy * kp1, c3 = -sy * kd1, c4 = -sw * kp2, c5 = -sw * kd2;
        rows[rowOffset] = c0;
        rows[rowOffset + 1] = c1;
        rows[rowOffset + 2] = c2;
        rows[rowOffset + 3] = c3;
        rows[rowOffset + 4] = c4;
        rows[rowOffset + 5] = c5;
        if (heldSpeedBound[k] === 1) {
          for (let axis = 0; axis < GOVERNED_AXES; axis++) referenceRows[mo + axis] = 0;
          kinds[k] = INSTANT;
          heldSpeedBound[k] = 0;
        }
        // erg.refreshConstraint(k) written out for this entry (INSTANT, zero reference row), on
        // the row still in registers: the same products summed in the same order, so the same
        // bits (profiled: writing the rows and reading them back in a separate pass per foot was
        // a tenth of a governed tick).
        let s = 0;
        s += c0 * p0 * c0;
        s += c0 * p1 * c1;
        s += c1 * p2 * c0;
        s += c1 * p3 * c1;
        s += c2 * p4 * c2;
        s += c2 * p5 * c3;
        s += c3 * p6 * c2;
        s += c3 * p7 * c3;
        s += c4 * p8 * c4;
        s += c4 * p9 * c5;
        s += c5 * p10 * c4;
        s += c5 * p11 * c5;
        weights[k] = s > 1e-300 ? 1 / Math.sqrt(s) : 0;
        const t0 = 0 + sv0 * c1, t1 = 0 + sv1 * c3, t2 = 0 + sv2 * c5;
        jumpRows[mo] = t0;
        jumpRows[mo + 1] = t1;
        jumpRows[mo + 2] = t2;
        // The reference row is zero (+0), so n = 0 + Sᵀc; x/1 = x, so unit axes skip the division.
        let n0 = 0 + t0, n1 = 0 + t1, n2 = 0 + t2;
        if (!unit0) n0 /= scale0;
        if (!unit1) n1 /= scale1;
        if (!unit2) n2 /= scale2;
        let norm2 = 0;
        norm2 += n0 * n0;
        norm2 += n1 * n1;
        norm2 += n2 * n2;
        const inverseNorm = norm2 > 0 ? 1 / Math.sqrt(norm2) : 0;
        inverseNorms[k] = inverseNorm;
        normals[mo] = n0 * inverseNorm;
        normals[mo + 1] = n1 * inverseNorm;
        normals[mo + 2] = n2 * inverseNorm;
        k++;
      }
    }
    // Unchanged since they were copied unless the stance count moved them (nothing else writes
    // past the stance constraints), so the table holds what copying every tick would give.
    const speedBoundCount = this.speedBounds.count;
    if (k !== this.speedBoundsAt) {
      this.speedBounds.copyTo(erg, k);
      for (let e = 0; e < speedBoundCount; e++) heldSpeedBound[k + e] = 1;
      this.speedBoundsAt = k;
    }
    erg.count = k + speedBoundCount;
  }

  /** One governor step from the error state z (see trunk.ts for its layout). */
  update(z: ArrayLike<number>): void {
    this.erg.update(z, this.target);
  }
}

/** A saved run of constraint-table entries (with their cached values), copied in and out whole. */
class ConstraintBlock {
  readonly count: number;
  private readonly n: number;
  private readonly m: number;
  private readonly rows: Float64Array;
  private readonly referenceRows: Float64Array;
  private readonly bounds: Float64Array;
  private readonly kinds: Uint8Array;
  private readonly inverseSqrtDenominator: Float64Array;
  private readonly jumpRows: Float64Array;
  private readonly repulsionNormal: Float64Array;
  private readonly repulsionInverseNorm: Float64Array;

  constructor(count: number, erg: ExplicitReferenceGovernor) {
    const n = erg.n, m = erg.m;
    this.count = count;
    this.n = n;
    this.m = m;
    this.rows = new Float64Array(count * n);
    this.referenceRows = new Float64Array(count * m);
    this.bounds = new Float64Array(count);
    this.kinds = new Uint8Array(count);
    this.inverseSqrtDenominator = new Float64Array(count);
    this.jumpRows = new Float64Array(count * m);
    this.repulsionNormal = new Float64Array(count * m);
    this.repulsionInverseNorm = new Float64Array(count);
  }

  copyFrom(erg: ExplicitReferenceGovernor, k: number): void {
    const c = this.count, n = this.n, m = this.m;
    this.rows.set(erg.rows.subarray(k * n, (k + c) * n));
    this.referenceRows.set(erg.referenceRows.subarray(k * m, (k + c) * m));
    this.bounds.set(erg.bounds.subarray(k, k + c));
    this.kinds.set(erg.kinds.subarray(k, k + c));
    this.inverseSqrtDenominator.set(erg.inverseSqrtDenominator.subarray(k, k + c));
    this.jumpRows.set(erg.jumpRows.subarray(k * m, (k + c) * m));
    this.repulsionNormal.set(erg.repulsionNormal.subarray(k * m, (k + c) * m));
    this.repulsionInverseNorm.set(erg.repulsionInverseNorm.subarray(k, k + c));
  }

  /** Element loops, not TypedArray.set(subarray): a subarray is an allocation. */
  copyTo(erg: ExplicitReferenceGovernor, k: number): void {
    const c = this.count, n = this.n, m = this.m;
    for (let e = 0; e < c * n; e++) erg.rows[k * n + e] = this.rows[e];
    for (let e = 0; e < c * m; e++) {
      erg.referenceRows[k * m + e] = this.referenceRows[e];
      erg.jumpRows[k * m + e] = this.jumpRows[e];
      erg.repulsionNormal[k * m + e] = this.repulsionNormal[e];
    }
    for (let e = 0; e < c; e++) {
      erg.bounds[k + e] = this.bounds[e];
      erg.kinds[k + e] = this.kinds[e];
      erg.inverseSqrtDenominator[k + e] = this.inverseSqrtDenominator[e];
      erg.repulsionInverseNorm[k + e] = this.repulsionInverseNorm[e];
    }
  }
}
