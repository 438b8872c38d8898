// Explicit reference governor (Garone & Nicotra, IEEE TAC 2016; Nicotra & Garone, IEEE Control
// Systems Magazine 2018), discrete-time update at the control period T in the spirit of
// Hosseinzadeh et al. 2024. Generic over the reference dimension m and error-state dimension n,
// fixed-size, allocation-free.
//
// Model. A pre-stabilised system with reference v has an equilibrium x̄_v; z = x − x̄_v is the
// tracking error and V = zᵀ·P·z a Lyapunov function of its (closed-loop) dynamics, non-increasing
// while v is held. Constraint k is linear: c_kᵀ·z + e_kᵀ·v ≤ d_k. At the equilibrium (z = 0) its
// margin is d_k − e_kᵀ·v, and the largest level set {V ≤ Γ} inside it has
//   Γ_k = max(d_k − e_kᵀ·v, 0)² / (c_kᵀ·P⁻¹·c_k),   Γ = min_k Γ_k.
// Update (one call per control period):
//   Δ = κ·(Γ − V), clipped at ≥ 0,
//   ρ = (r − v)/max(‖r − v‖, η) + Σ_k max((ζ − dist_k)/(ζ − δ), 0)·(−n_k/‖n_k‖),
//   v ← v + T·Δ·ρ.
// dist_k is the distance of v to constraint k's hyperplane n_kᵀ·v ≤ b_k in reference space: the
// steady-state one (n = e, b = d: the textbook navigation field) or the instantaneous one at the
// current state (n = Sᵀc + e, b = d − cᵀz + (Sᵀc)ᵀv, for constraints whose steady state does not
// depend on v, such as contact forces driven by acceleration).
// Discrete-time condition. Changing v by δv makes z jump by S·δv (S is given: the equilibrium moves
// with v) and changes Γ. We cap Δ so that, by the triangle inequality in the P-norm,
//   √V + T·Δ·(Σ_j |ρ_j|·‖S_j‖_P + max_k |e_kᵀρ|/√(c_kᵀP⁻¹c_k)) ≤ √Γ,
// which keeps V(z⁺) ≤ Γ(v⁺) after the jump; between updates V does not grow, so the state stays
// in the constraint set whenever it started inside {V ≤ Γ}. Δ is also capped so the attraction
// step never overshoots the target. Reference coordinates are scaled per axis (referenceScale) so
// that η, ζ, δ and the norms mix axes of different units sensibly.

export const STEADY = 0;
export const INSTANT = 1;

export interface GovernorConfig {
  referenceDimension: number;
  stateDimension: number;
  maxConstraints: number;
  /** P (n×n, row-major, symmetric positive definite). */
  lyapunov: ArrayLike<number>;
  /** S (n×m, row-major): z jumps by S·δv when the applied reference moves by δv. */
  jump: ArrayLike<number>;
  /** Per-axis scale of the reference for ρ (1 = use the reference as is). */
  referenceScale?: ArrayLike<number>;
  gain: number;
  smoothing: number;
  influence: number;
  margin: number;
  period_s: number;
}

export class ExplicitReferenceGovernor {
  readonly m: number;
  readonly n: number;
  readonly maxConstraints: number;
  readonly applied: Float64Array;
  readonly lyapunov: Float64Array;
  readonly lyapunovInverse: Float64Array;
  readonly jump: Float64Array;
  readonly scale: Float64Array;
  gain: number;
  smoothing: number;
  influence: number;
  margin: number;
  period_s: number;
  // Constraint table: c_kᵀz + e_kᵀv ≤ d_k, kind STEADY or INSTANT.
  count = 0;
  readonly rows: Float64Array;
  readonly referenceRows: Float64Array;
  readonly bounds: Float64Array;
  readonly kinds: Uint8Array;
  /** 1/√(c_kᵀP⁻¹c_k) (0 when c_k = 0), refreshed by refreshConstraint(). */
  readonly inverseSqrtDenominator: Float64Array;
  /** Sᵀc_k, refreshed by refreshConstraint(). */
  readonly jumpRows: Float64Array;
  /** Unit normal of constraint k's reference-space hyperplane in scaled coordinates (0 if none). */
  readonly repulsionNormal: Float64Array;
  /** 1/‖n_k‖ in scaled coordinates (0 when the hyperplane does not depend on v). */
  readonly repulsionInverseNorm: Float64Array;
  /**
   * Last update, for telemetry and tests: (V, Γ, Δ, √Γ). Kept in a typed array rather than in
   * number fields so that V8 never has to box a double stored into a generalised field.
   */
  readonly last = new Float64Array(4);
  get lyapunovValue(): number {
    return this.last[0];
  }
  get threshold(): number {
    return this.last[1];
  }
  get delta(): number {
    return this.last[2];
  }
  private readonly jumpNorm: Float64Array;
  private readonly field: Float64Array;
  // Nonzero patterns (compressed rows) of P, P⁻¹ and the columns of S, fixed at construction
  // (P⁻¹'s and S's are read by a caller that refreshes its constraints itself: governor.ts).
  // The trunk's P is block-diagonal and S has one entry per column, so the per-constraint
  // quadratic forms touch a third of the n×n entries; skipping exact zeros changes no sum
  // (x + 0 = x), so the results are those of the dense loops (profiled: the dense
  // refreshConstraint was the largest single cost of a governed tick).
  private readonly pStart: Int32Array;
  private readonly pIndex: Int32Array;
  private readonly pValue: Float64Array;
  private readonly piStart: Int32Array;
  private readonly piIndex: Int32Array;
  readonly piValue: Float64Array;
  private readonly sStart: Int32Array;
  readonly sIndex: Int32Array;
  readonly sValue: Float64Array;

  constructor(config: GovernorConfig) {
    const m = config.referenceDimension, n = config.stateDimension, k = config.maxConstraints;
    this.m = m;
    this.n = n;
    this.maxConstraints = k;
    if (config.lyapunov.length !== n * n) throw new Error(`governor: P has ${config.lyapunov.length} entries, expected ${n * n}`);
    if (config.jump.length !== n * m) throw new Error(`governor: S has ${config.jump.length} entries, expected ${n * m}`);
    this.applied = new Float64Array(m);
    this.lyapunov = Float64Array.from(config.lyapunov);
    this.lyapunovInverse = invertSymmetric(this.lyapunov, n);
    this.jump = Float64Array.from(config.jump);
    this.scale = config.referenceScale ? Float64Array.from(config.referenceScale) : new Float64Array(m).fill(1);
    this.gain = config.gain;
    this.smoothing = config.smoothing;
    this.influence = config.influence;
    this.margin = config.margin;
    this.period_s = config.period_s;
    this.rows = new Float64Array(k * n);
    this.referenceRows = new Float64Array(k * m);
    this.bounds = new Float64Array(k);
    this.kinds = new Uint8Array(k);
    this.inverseSqrtDenominator = new Float64Array(k);
    this.jumpRows = new Float64Array(k * m);
    this.repulsionNormal = new Float64Array(k * m);
    this.repulsionInverseNorm = new Float64Array(k);
    this.jumpNorm = new Float64Array(m);
    this.field = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      let s = 0;
      for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) s += this.jump[a * m + j] * this.lyapunov[a * n + b] * this.jump[b * m + j];
      this.jumpNorm[j] = Math.sqrt(Math.max(0, s));
    }
    [this.pStart, this.pIndex, this.pValue] = compressRows(this.lyapunov, n, n);
    [this.piStart, this.piIndex, this.piValue] = compressRows(this.lyapunovInverse, n, n);
    // Columns of S (S is n×m row-major): its transpose's rows.
    const jumpTransposed = new Float64Array(m * n);
    for (let a = 0; a < n; a++) for (let j = 0; j < m; j++) jumpTransposed[j * n + a] = this.jump[a * m + j];
    [this.sStart, this.sIndex, this.sValue] = compressRows(jumpTransposed, m, n);
    this.unitScale = new Uint8Array(m);
    for (let j = 0; j < m; j++) this.unitScale[j] = this.scale[j] === 1 ? 1 : 0;
    this.blockPattern = isBlockPattern(m, n, this.piStart, this.piIndex, this.sStart);
  }

  /**
   * True when m = 3, n = 6, P⁻¹ is block-diagonal in three full 2×2 blocks and each column of S
   * has exactly one nonzero: the trunk governor's shape, for which refreshConstraint is written out.
   */
  readonly blockPattern: boolean;
  /** 1 where scale[j] === 1. */
  readonly unitScale: Uint8Array;

  /** Recomputes the cached denominator, Sᵀc and repulsion normal of constraint k (set kinds[k] first). */
  refreshConstraint(k: number): void {
    if (this.blockPattern) this.refreshBlockConstraint(k);
    else this.refreshGenericConstraint(k);
  }

  /**
   * refreshConstraint() for the block pattern (see blockPattern), written out: the same products
   * summed in the same order as the compressed-row loops, so the same bits.
   */
  private refreshBlockConstraint(k: number): void {
    const c = this.rows, o = 6 * k, pv = this.piValue;
    // No skipping of zero entries here: for finite c a skipped term is ±0 and s (which starts
    // at +0) is unchanged by adding it; with an infinite or NaN entry both forms end in
    // s = ∞ or NaN, i.e. a zero weight below. So the bits are those of the compressed loops.
    let s = 0;
    for (let b = 0; b < 3; b++) {
      const ca = c[o + 2 * b], cb = c[o + 2 * b + 1], e = 4 * b;
      s += ca * pv[e] * ca;
      s += ca * pv[e + 1] * cb;
      s += cb * pv[e + 2] * ca;
      s += cb * pv[e + 3] * cb;
    }
    this.inverseSqrtDenominator[k] = s > 1e-300 ? 1 / Math.sqrt(s) : 0;
    const sIndex = this.sIndex, sValue = this.sValue, scale = this.scale;
    const instant = this.kinds[k] === INSTANT, mo = 3 * k;
    const t0 = 0 + sValue[0] * c[o + sIndex[0]];
    const t1 = 0 + sValue[1] * c[o + sIndex[1]];
    const t2 = 0 + sValue[2] * c[o + sIndex[2]];
    this.jumpRows[mo] = t0;
    this.jumpRows[mo + 1] = t1;
    this.jumpRows[mo + 2] = t2;
    let n0 = this.referenceRows[mo], n1 = this.referenceRows[mo + 1], n2 = this.referenceRows[mo + 2];
    if (instant) {
      n0 += t0; n1 += t1; n2 += t2;
    }
    // x/1 = x exactly, so unit axes skip the division (same bits, fewer divisions).
    const unit = this.unitScale;
    if (unit[0] === 0) n0 /= scale[0];
    if (unit[1] === 0) n1 /= scale[1];
    if (unit[2] === 0) n2 /= scale[2];
    let norm2 = 0;
    norm2 += n0 * n0;
    norm2 += n1 * n1;
    norm2 += n2 * n2;
    const inverseNorm = norm2 > 0 ? 1 / Math.sqrt(norm2) : 0;
    this.repulsionInverseNorm[k] = inverseNorm;
    this.repulsionNormal[mo] = n0 * inverseNorm;
    this.repulsionNormal[mo + 1] = n1 * inverseNorm;
    this.repulsionNormal[mo + 2] = n2 * inverseNorm;
  }

  private refreshGenericConstraint(k: number): void {
    const n = this.n, m = this.m, c = this.rows, o = k * n;
    const piStart = this.piStart, piIndex = this.piIndex, piValue = this.piValue;
    let s = 0;
    for (let a = 0; a < n; a++) {
      const ca = c[o + a];
      if (ca === 0) continue;
      for (let e = piStart[a], end = piStart[a + 1]; e < end; e++) s += ca * piValue[e] * c[o + piIndex[e]];
    }
    this.inverseSqrtDenominator[k] = s > 1e-300 ? 1 / Math.sqrt(s) : 0;
    const sStart = this.sStart, sIndex = this.sIndex, sValue = this.sValue;
    const instant = this.kinds[k] === INSTANT, mo = k * m;
    let norm2 = 0;
    for (let j = 0; j < m; j++) {
      let t = 0;
      for (let e = sStart[j], end = sStart[j + 1]; e < end; e++) t += sValue[e] * c[o + sIndex[e]];
      this.jumpRows[mo + j] = t;
      let nj = this.referenceRows[mo + j];
      if (instant) nj += t;
      nj /= this.scale[j];
      this.repulsionNormal[mo + j] = nj;
      norm2 += nj * nj;
    }
    const inverseNorm = norm2 > 0 ? 1 / Math.sqrt(norm2) : 0;
    this.repulsionInverseNorm[k] = inverseNorm;
    for (let j = 0; j < m; j++) this.repulsionNormal[mo + j] *= inverseNorm;
  }

  // The two helpers below store their result in a field instead of returning it: a double
  // returned from a call V8 does not inline is boxed, i.e. allocated, on every call.

  /** last[0] ← V = zᵀPz. */
  computeLyapunov(z: ArrayLike<number>): void {
    const n = this.n, start = this.pStart, index = this.pIndex, value = this.pValue;
    let v = 0;
    for (let a = 0; a < n; a++) {
      const za = z[a];
      if (za === 0) continue;
      let row = 0;
      for (let e = start[a], end = start[a + 1]; e < end; e++) row += value[e] * z[index[e]];
      v += za * row;
    }
    this.last[0] = v;
  }

  /** last[3] ← √Γ(v) for the applied reference (Infinity when no constraint limits it). */
  computeThreshold(): void {
    const m = this.m, v = this.applied;
    let best = Infinity;
    for (let k = 0; k < this.count; k++) {
      let marginK = this.bounds[k];
      for (let j = 0; j < m; j++) marginK -= this.referenceRows[k * m + j] * v[j];
      const w = this.inverseSqrtDenominator[k];
      if (w === 0) {
        if (marginK < 0) {
          best = 0;
          break;
        }
        continue;
      }
      const level = marginK > 0 ? marginK * w : 0;
      if (level < best) best = level;
    }
    this.last[3] = best;
  }

  /** One governor step: moves `applied` toward `target` given the current error state z. */
  update(z: ArrayLike<number>, target: ArrayLike<number>): void {
    if (this.m === 3 && this.n === 6) this.update3x6(z, target);
    else this.updateGeneric(z, target);
  }

  /**
   * update() for m = 3, n = 6 (the trunk governor), written out. Same operations in the same
   * order as updateGeneric (so the same bits), except that the threshold pass is folded into
   * the repulsion pass (both only read the table) and field/scale is divided once per axis, not
   * once per constraint (the same quotient). Profiled: the generic loops' index arithmetic and
   * bounds checks were most of the governor's cost.
   */
  private update3x6(z: ArrayLike<number>, target: ArrayLike<number>): void {
    const v = this.applied, scale = this.scale, field = this.field, last = this.last;
    this.computeLyapunov(z);
    const lyap = last[0];
    const sqrtV = Math.sqrt(lyap);
    const z0 = z[0], z1 = z[1], z2 = z[2], z3 = z[3], z4 = z[4], z5 = z[5];
    const v0 = v[0], v1 = v[1], v2 = v[2];
    const s0 = scale[0], s1 = scale[1], s2 = scale[2];

    // Attraction, in scaled reference coordinates.
    let f0 = (target[0] - v0) * s0, f1 = (target[1] - v1) * s1, f2 = (target[2] - v2) * s2;
    let distance = 0;
    distance += f0 * f0;
    distance += f1 * f1;
    distance += f2 * f2;
    distance = Math.sqrt(distance);
    const reach = distance > this.smoothing ? distance : this.smoothing;
    f0 /= reach; f1 /= reach; f2 /= reach;

    // √Γ (computeThreshold) and the repulsion from the hyperplanes within the influence zone ζ.
    const influence = this.influence, span = influence - this.margin, count = this.count;
    const rows = this.rows, jumpRows = this.jumpRows, normals = this.repulsionNormal, bounds = this.bounds;
    const kinds = this.kinds, inverseNorms = this.repulsionInverseNorm;
    const referenceRows = this.referenceRows, weights = this.inverseSqrtDenominator;
    let best = Infinity;
    for (let k = 0; k < count; k++) {
      const o = 6 * k, mo = 3 * k;
      const bound = bounds[k];
      const e0 = referenceRows[mo], e1 = referenceRows[mo + 1], e2 = referenceRows[mo + 2];
      const w = weights[k];
      let marginK = bound;
      marginK -= e0 * v0;
      marginK -= e1 * v1;
      marginK -= e2 * v2;
      if (w === 0) {
        if (marginK < 0) best = 0;
      } else {
        const level = marginK > 0 ? marginK * w : 0;
        if (level < best) best = level;
      }
      const inverseNorm = inverseNorms[k];
      if (inverseNorm === 0) continue;
      let offset = bound;
      if (kinds[k] === INSTANT) {
        offset -= rows[o] * z0;
        offset -= rows[o + 1] * z1;
        offset -= rows[o + 2] * z2;
        offset -= rows[o + 3] * z3;
        offset -= rows[o + 4] * z4;
        offset -= rows[o + 5] * z5;
        offset += jumpRows[mo] * v0;
        offset += jumpRows[mo + 1] * v1;
        offset += jumpRows[mo + 2] * v2;
      }
      const n0 = normals[mo], n1 = normals[mo + 1], n2 = normals[mo + 2];
      let value = 0;
      value += n0 * v0 * s0;
      value += n1 * v1 * s1;
      value += n2 * v2 * s2;
      const dist = offset * inverseNorm - value;
      if (dist >= influence) continue;
      const strength = (influence - dist) / span;
      f0 -= strength * n0;
      f1 -= strength * n1;
      f2 -= strength * n2;
    }
    last[3] = best;
    const sqrtGamma = best;
    const threshold = sqrtGamma * sqrtGamma;
    last[1] = threshold;
    field[0] = f0; field[1] = f1; field[2] = f2;

    // Dynamic safety margin, with the discrete-time and no-overshoot caps.
    let delta = this.gain * (threshold - lyap);
    if (!(delta > 0)) delta = 0;
    if (delta > 0) {
      const u0 = f0 / s0, u1 = f1 / s1, u2 = f2 / s2;
      const jumpNorm = this.jumpNorm;
      let beta = 0;
      beta += Math.abs(u0) * jumpNorm[0];
      beta += Math.abs(u1) * jumpNorm[1];
      beta += Math.abs(u2) * jumpNorm[2];
      let shift = 0;
      for (let k = 0; k < count; k++) {
        const mo = 3 * k;
        let s = 0;
        s += referenceRows[mo] * u0;
        s += referenceRows[mo + 1] * u1;
        s += referenceRows[mo + 2] * u2;
        const t = Math.abs(s) * weights[k];
        if (t > shift) shift = t;
      }
      beta += shift;
      if (beta > 0 && sqrtGamma !== Infinity) {
        const cap = (sqrtGamma - sqrtV) / (this.period_s * beta);
        if (delta > cap) delta = cap > 0 ? cap : 0;
      }
      const noOvershoot = reach / this.period_s;
      if (delta > noOvershoot) delta = noOvershoot;
    }
    last[2] = delta;
    const step = this.period_s * delta;
    v[0] = v0 + (step * f0) / s0;
    v[1] = v1 + (step * f1) / s1;
    v[2] = v2 + (step * f2) / s2;
  }

  private updateGeneric(z: ArrayLike<number>, target: ArrayLike<number>): void {
    const m = this.m, n = this.n, v = this.applied, scale = this.scale, field = this.field;
    this.computeLyapunov(z);
    this.computeThreshold();
    const lyap = this.last[0];
    const sqrtV = Math.sqrt(lyap);
    const sqrtGamma = this.last[3];
    const threshold = sqrtGamma * sqrtGamma;
    this.last[1] = threshold;

    // Attraction, in scaled reference coordinates.
    let distance = 0;
    for (let j = 0; j < m; j++) {
      const d = (target[j] - v[j]) * scale[j];
      field[j] = d;
      distance += d * d;
    }
    distance = Math.sqrt(distance);
    const reach = distance > this.smoothing ? distance : this.smoothing;
    for (let j = 0; j < m; j++) field[j] /= reach;

    // Repulsion from the hyperplanes within the influence zone ζ (unit normals precomputed).
    const influence = this.influence, span = influence - this.margin, count = this.count;
    const rows = this.rows, jumpRows = this.jumpRows, normals = this.repulsionNormal, bounds = this.bounds;
    const kinds = this.kinds, inverseNorms = this.repulsionInverseNorm;
    for (let k = 0; k < count; k++) {
      const inverseNorm = inverseNorms[k];
      if (inverseNorm === 0) continue;
      let offset = bounds[k];
      let value = 0;
      const o = k * n, mo = k * m;
      if (kinds[k] === INSTANT) {
        for (let a = 0; a < n; a++) offset -= rows[o + a] * z[a];
        for (let j = 0; j < m; j++) offset += jumpRows[mo + j] * v[j];
      }
      for (let j = 0; j < m; j++) value += normals[mo + j] * v[j] * scale[j];
      const dist = offset * inverseNorm - value;
      if (dist >= influence) continue;
      const strength = (influence - dist) / span;
      for (let j = 0; j < m; j++) field[j] -= strength * normals[mo + j];
    }

    // Dynamic safety margin, with the discrete-time and no-overshoot caps.
    let delta = this.gain * (threshold - lyap);
    if (!(delta > 0)) delta = 0;
    if (delta > 0) {
      let beta = 0;
      for (let j = 0; j < m; j++) beta += Math.abs(field[j] / scale[j]) * this.jumpNorm[j];
      let shift = 0;
      const referenceRows = this.referenceRows, weights = this.inverseSqrtDenominator;
      for (let k = 0; k < count; k++) {
        let s = 0;
        for (let j = 0; j < m; j++) s += referenceRows[k * m + j] * (field[j] / scale[j]);
        const w = weights[k];
        const t = Math.abs(s) * w;
        if (t > shift) shift = t;
      }
      beta += shift;
      if (beta > 0 && sqrtGamma !== Infinity) {
        const cap = (sqrtGamma - sqrtV) / (this.period_s * beta);
        if (delta > cap) delta = cap > 0 ? cap : 0;
      }
      const noOvershoot = reach / this.period_s;
      if (delta > noOvershoot) delta = noOvershoot;
    }
    this.last[2] = delta;
    const step = this.period_s * delta;
    for (let j = 0; j < m; j++) v[j] += (step * field[j]) / scale[j];
  }
}

function isBlockPattern(m: number, n: number, piStart: Int32Array, piIndex: Int32Array, sStart: Int32Array): boolean {
  if (m !== 3 || n !== 6) return false;
  for (let a = 0; a < n; a++) {
    const first = a - (a % 2);
    if (piStart[a] !== 2 * a || piStart[a + 1] !== 2 * a + 2) return false;
    if (piIndex[2 * a] !== first || piIndex[2 * a + 1] !== first + 1) return false;
  }
  for (let j = 0; j < m; j++) if (sStart[j] !== j || sStart[j + 1] !== j + 1) return false;
  return true;
}

/** Compressed rows (start, column index, value) of the nonzeros of a rows×cols row-major matrix (setup only). */
function compressRows(a: Float64Array, rows: number, cols: number): [Int32Array, Int32Array, Float64Array] {
  const start = new Int32Array(rows + 1);
  const index: number[] = [];
  const value: number[] = [];
  for (let r = 0; r < rows; r++) {
    start[r] = index.length;
    for (let c = 0; c < cols; c++) {
      const x = a[r * cols + c];
      if (x !== 0) {
        index.push(c);
        value.push(x);
      }
    }
  }
  start[rows] = index.length;
  return [start, Int32Array.from(index), Float64Array.from(value)];
}

/** Inverse of a small SPD matrix by Gauss–Jordan elimination (setup time only; allocates). */
export function invertSymmetric(a: ArrayLike<number>, n: number): Float64Array {
  const work = Float64Array.from(a);
  const inverse = new Float64Array(n * n);
  for (let i = 0; i < n; i++) inverse[i * n + i] = 1;
  for (let col = 0; col < n; col++) {
    let pivotRow = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(work[r * n + col]) > Math.abs(work[pivotRow * n + col])) pivotRow = r;
    const pivot = work[pivotRow * n + col];
    if (Math.abs(pivot) < 1e-300) throw new Error('governor: P is singular');
    if (pivotRow !== col) {
      for (let c = 0; c < n; c++) {
        let t = work[col * n + c]; work[col * n + c] = work[pivotRow * n + c]; work[pivotRow * n + c] = t;
        t = inverse[col * n + c]; inverse[col * n + c] = inverse[pivotRow * n + c]; inverse[pivotRow * n + c] = t;
      }
    }
    for (let c = 0; c < n; c++) {
      work[col * n + c] /= pivot;
      inverse[col * n + c] /= pivot;
    }
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = work[r * n + col];
      if (f === 0) continue;
      for (let c = 0; c < n; c++) {
        work[r * n + c] -= f * work[col * n + c];
        inverse[r * n + c] -= f * inverse[col * n + c];
      }
    }
  }
  return inverse;
}

/**
 * P of the PD error dynamics ë = −k_p·e − k_d·ė (state (e, ė)) solving AᵀP + PA = −Q with
 * Q = diag(q_p, q_v), closed form for the 2×2 Lyapunov equation. Writes [p11, p12, p22] to out.
 */
export function pdLyapunov(out: Float64Array, kp: number, kd: number, qp: number, qv: number): Float64Array {
  if (!(kp > 0 && kd > 0)) throw new Error(`governor: PD gains must be positive for a Lyapunov function (k_p = ${kp}, k_d = ${kd})`);
  const p12 = qp / (2 * kp);
  const p22 = (p12 + qv / 2) / kd;
  const p11 = kp * p22 + kd * p12;
  out[0] = p11;
  out[1] = p12;
  out[2] = p22;
  return out;
}
