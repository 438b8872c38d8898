// Swing-foot trajectories: a cubic Bézier (bezier.ts) in the world frame from the foot's lift-off
// point to a touchdown point re-planned every tick with Raibert's heuristic (Raibert, Legged
// Robots That Balance, 1986, ch. 2): the foot lands at the hip's predicted position at touchdown
// plus v·T_stance/2 (the neutral point, so the hip passes over the foot mid-stance) plus
// k·(v − v_ref) (velocity feedback), limited to the leg's reach. The world-frame target and its
// velocity are turned into the hip-relative, trunk-frame target the plant's leg impedance tracks.

import { bezierBernstein, bezierDerivative, swingControlPoints } from './bezier.js';
import { rotateTransposed } from './linalg.js';

export interface SwingTiming {
  stance_s: number;
  swing_s: number;
  apex_m: number;
  raibertGain_s: number;
  /** Largest horizontal step from the hip's predicted touchdown position. */
  reach_m: number;
}

// Per-tick numbers come in through arrays (the scheduler's), not as arguments: doubles passed to
// a call V8 does not inline are boxed, which would allocate every tick.
export class SwingPlanner {
  readonly legCount: number;
  /** World position of each foot at its last lift-off. */
  readonly liftOff_m: Float64Array;
  readonly touchdown_m: Float64Array;
  /** Control points per leg (12 each), refreshed by evaluate(). */
  readonly control: Float64Array[];
  private readonly point = new Float64Array(3);
  private readonly rate = new Float64Array(3);
  private readonly relative = new Float64Array(3);

  readonly timing: SwingTiming;

  constructor(legCount: number, timing: SwingTiming) {
    this.timing = timing;
    this.legCount = legCount;
    this.liftOff_m = new Float64Array(3 * legCount);
    this.touchdown_m = new Float64Array(3 * legCount);
    this.control = [];
    for (let i = 0; i < legCount; i++) this.control.push(new Float64Array(12));
  }

  captureLiftOff(leg: number, footPosition_m: Float64Array): void {
    for (let c = 0; c < 3; c++) this.liftOff_m[3 * leg + c] = footPosition_m[3 * leg + c];
  }

  /**
   * Raibert touchdown point for `leg` (world, on the ground plane z = 0).
   * hipArm: hip relative to the centre of mass (world); velocity: measured trunk velocity;
   * reference: applied (v_x, v_y, ψ̇).
   */
  planTouchdown(
    leg: number,
    trunkPosition_m: Float64Array,
    hipArms: Float64Array,
    velocity_mps: Float64Array,
    reference: Float64Array,
    remaining: Float64Array,
  ): void {
    const o = 3 * leg;
    const remaining_s = remaining[leg], stance_s = this.timing.stance_s, gain_s = this.timing.raibertGain_s;
    const reach_m = this.timing.reach_m;
    const rx = hipArms[o], ry = hipArms[o + 1];
    // Hip velocity under the reference motion (v + ψ̇ẑ × r) predicts where the hip will be.
    const hipVx = reference[0] - reference[2] * ry;
    const hipVy = reference[1] + reference[2] * rx;
    const hipX = trunkPosition_m[0] + rx + hipVx * remaining_s;
    const hipY = trunkPosition_m[1] + ry + hipVy * remaining_s;
    let dx = velocity_mps[0] * 0.5 * stance_s + gain_s * (velocity_mps[0] - reference[0]);
    let dy = velocity_mps[1] * 0.5 * stance_s + gain_s * (velocity_mps[1] - reference[1]);
    const step = Math.sqrt(dx * dx + dy * dy);
    if (step > reach_m) {
      dx *= reach_m / step;
      dy *= reach_m / step;
    }
    this.touchdown_m[o] = hipX + dx;
    this.touchdown_m[o + 1] = hipY + dy;
    this.touchdown_m[o + 2] = 0;
  }

  /**
   * Target position and velocity of a swing foot relative to its hip, trunk frame, at swing
   * progress s = progress[leg] ∈ [0, 1].
   */
  evaluate(
    leg: number,
    progress: Float64Array,
    rotation: Float64Array,
    trunkPosition_m: Float64Array,
    trunkVelocity_mps: Float64Array,
    angularVelocityWorld: Float64Array,
    hipArms: Float64Array,
    target_m: Float64Array,
    targetVelocity_mps: Float64Array,
  ): void {
    const o = 3 * leg;
    const s = progress[leg], swing_s = this.timing.swing_s, apex_m = this.timing.apex_m;
    const p = this.control[leg];
    swingControlPoints(p, this.liftOff_m, o, this.touchdown_m, o, apex_m);
    bezierBernstein(this.point, 0, p, s);
    bezierDerivative(this.rate, 0, p, s);
    const w = angularVelocityWorld, rx = hipArms[o], ry = hipArms[o + 1], rz = hipArms[o + 2];
    const rel = this.relative;
    rel[0] = this.point[0] - (trunkPosition_m[0] + rx);
    rel[1] = this.point[1] - (trunkPosition_m[1] + ry);
    rel[2] = this.point[2] - (trunkPosition_m[2] + rz);
    rotateTransposed(target_m, o, rotation, rel, 0);
    // Velocity of the curve minus the hip's velocity v + ω × r.
    const inv = 1 / swing_s;
    rel[0] = this.rate[0] * inv - (trunkVelocity_mps[0] + w[1] * rz - w[2] * ry);
    rel[1] = this.rate[1] * inv - (trunkVelocity_mps[1] + w[2] * rx - w[0] * rz);
    rel[2] = this.rate[2] * inv - (trunkVelocity_mps[2] + w[0] * ry - w[1] * rx);
    rotateTransposed(targetVelocity_mps, o, rotation, rel, 0);
  }
}
