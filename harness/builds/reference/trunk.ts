// Trunk posture control. A reference state (position integrating the applied velocity, yaw
// integrating the applied yaw rate, height = standing height, roll = pitch = 0) is tracked by PD
// laws at the acceleration level; the wanted accelerations become the wanted wrench on the whole
// robot: F = M·(a − g) with M = trunk + feet, τ = I_w·α + ω × I_w·ω (Euler's equations in the
// world frame, I_w = R·I·Rᵀ). The horizontal position and yaw PD are split out as
//   u = (a_x, a_y, α_z) = −K·z,  z = (e_px, e_vx, e_py, e_vy, e_ψ, e_ω),  e = actual − reference,
// and the wrench is w = w0 + B·u with w0 the rest (gravity, height, roll/pitch, gyroscopic).
// That affine split is what makes each force constraint a hyperplane for the governor.

import type { Observation } from '../interface.js';
import type { RobotParams } from '../../plant/types.js';
import { matrixFromQuaternion, rotate } from './linalg.js';
import type { ReferenceOptions } from './options.js';

/** Yaw ψ of a (w, x, y, z) quaternion (Z-Y-X Euler convention). */
export function yawOf(q: Float64Array): number {
  const w = q[0], x = q[1], y = q[2], z = q[3];
  return Math.atan2(2 * (w * z + x * y), 1 - 2 * (y * y + z * z));
}

export class TrunkState {
  readonly rotation = new Float64Array(9);
  readonly inertiaWorld = new Float64Array(9);
  readonly angularVelocityWorld = new Float64Array(3);
  /** Hip positions relative to the centre of mass, world frame (3 per leg). */
  readonly hipArms: Float64Array;
  private readonly inertiaBody = new Float64Array(9);

  constructor(robot: RobotParams) {
    this.hipArms = new Float64Array(3 * robot.hips_m.length);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) this.inertiaBody[3 * r + c] = robot.trunk.inertia_kgm2[r][c];
  }

  /** Rotation and world angular velocity only (what the governor's error state needs). */
  updateRotation(obs: Observation): void {
    matrixFromQuaternion(this.rotation, obs.trunkQuaternion);
    rotate(this.angularVelocityWorld, 0, this.rotation, obs.trunkAngularVelocity_radps, 0);
  }

  update(obs: Observation, hipsBody: Float64Array): void {
    const rot = matrixFromQuaternion(this.rotation, obs.trunkQuaternion);
    rotate(this.angularVelocityWorld, 0, rot, obs.trunkAngularVelocity_radps, 0);
    const legs = hipsBody.length / 3;
    for (let i = 0; i < legs; i++) rotate(this.hipArms, 3 * i, rot, hipsBody, 3 * i);
    // I_w = R·I·Rᵀ, via S = I·Rᵀ, written out in locals (the same products and sums as the
    // 3×3 loops, so the same bits; profiled: the loops' index arithmetic cost more than the sums).
    const ib = this.inertiaBody, iw = this.inertiaWorld;
    const r0 = rot[0], r1 = rot[1], r2 = rot[2], r3 = rot[3], r4 = rot[4], r5 = rot[5], r6 = rot[6], r7 = rot[7], r8 = rot[8];
    const i0 = ib[0], i1 = ib[1], i2 = ib[2], i3 = ib[3], i4 = ib[4], i5 = ib[5], i6 = ib[6], i7 = ib[7], i8 = ib[8];
    const s0 = i0 * r0 + i1 * r1 + i2 * r2;
    const s1 = i0 * r3 + i1 * r4 + i2 * r5;
    const s2 = i0 * r6 + i1 * r7 + i2 * r8;
    const s3 = i3 * r0 + i4 * r1 + i5 * r2;
    const s4 = i3 * r3 + i4 * r4 + i5 * r5;
    const s5 = i3 * r6 + i4 * r7 + i5 * r8;
    const s6 = i6 * r0 + i7 * r1 + i8 * r2;
    const s7 = i6 * r3 + i7 * r4 + i8 * r5;
    const s8 = i6 * r6 + i7 * r7 + i8 * r8;
    iw[0] = r0 * s0 + r1 * s3 + r2 * s6;
    iw[1] = r0 * s1 + r1 * s4 + r2 * s7;
    iw[2] = r0 * s2 + r1 * s5 + r2 * s8;
    iw[3] = r3 * s0 + r4 * s3 + r5 * s6;
    iw[4] = r3 * s1 + r4 * s4 + r5 * s7;
    iw[5] = r3 * s2 + r4 * s5 + r5 * s8;
    iw[6] = r6 * s0 + r7 * s3 + r8 * s6;
    iw[7] = r6 * s1 + r7 * s4 + r8 * s7;
    iw[8] = r6 * s2 + r7 * s5 + r8 * s8;
  }
}

export class TrunkReference {
  readonly position_m = new Float64Array(3);
  yaw_rad = 0;
  /** Applied velocity and yaw rate (what the PD tracks). */
  readonly velocity_mps = new Float64Array(3);
  yawRate_radps = 0;
  initialised = false;
  readonly step_s: number;
  readonly maxPositionError_m: number;
  readonly maxYawError_rad: number;

  constructor(step_s: number, maxPositionError_m: number, maxYawError_rad: number) {
    this.step_s = step_s;
    this.maxPositionError_m = maxPositionError_m;
    this.maxYawError_rad = maxYawError_rad;
  }

  reset(obs: Observation, height_m: number): void {
    this.position_m[0] = obs.trunkPosition_m[0];
    this.position_m[1] = obs.trunkPosition_m[1];
    this.position_m[2] = height_m;
    this.yaw_rad = yawOf(obs.trunkQuaternion);
    this.velocity_mps.fill(0);
    this.yawRate_radps = 0;
    this.initialised = true;
  }

  /**
   * Integrates the applied velocity and yaw rate over one control period, then keeps the reference on a leash of
   * maxPositionError_m / maxYawError_rad around the trunk: after a slip the position error would
   * otherwise grow without bound and the PD would demand ever larger forces (common practice).
   */
  advance(obs: Observation): void {
    const dt_s = this.step_s, maxPositionError_m = this.maxPositionError_m, maxYawError_rad = this.maxYawError_rad;
    this.position_m[0] += this.velocity_mps[0] * dt_s;
    this.position_m[1] += this.velocity_mps[1] * dt_s;
    this.yaw_rad += this.yawRate_radps * dt_s;
    const dx = this.position_m[0] - obs.trunkPosition_m[0];
    const dy = this.position_m[1] - obs.trunkPosition_m[1];
    const distance = Math.sqrt(dx * dx + dy * dy);
    if (distance > maxPositionError_m) {
      const scale = maxPositionError_m / distance;
      this.position_m[0] = obs.trunkPosition_m[0] + dx * scale;
      this.position_m[1] = obs.trunkPosition_m[1] + dy * scale;
    }
    // yawOf() inlined: a double returned from a call V8 does not inline is boxed (allocates).
    const q = obs.trunkQuaternion;
    const yaw = Math.atan2(2 * (q[0] * q[3] + q[1] * q[2]), 1 - 2 * (q[2] * q[2] + q[3] * q[3]));
    let dyaw = this.yaw_rad - yaw;
    dyaw -= 2 * Math.PI * Math.round(dyaw / (2 * Math.PI));
    if (dyaw > maxYawError_rad) this.yaw_rad -= dyaw - maxYawError_rad;
    else if (dyaw < -maxYawError_rad) this.yaw_rad -= dyaw + maxYawError_rad;
  }
}

/** Index of each governed axis in u and of its (position, velocity) pair in z. */
export const AXIS_X = 0;
export const AXIS_Y = 1;
export const AXIS_YAW = 2;

export class TrunkPD {
  readonly totalMass_kg: number;
  readonly gravity_mps2: Float64Array;
  readonly options: ReferenceOptions;
  /** z = (e_px, e_vx, e_py, e_vy, e_ψ, e_ω) against the reference (velocity part: see setVelocityReference). */
  readonly error = new Float64Array(6);
  /** baseWrench then inputWrench in one buffer, so the distribution solves all four at once. */
  readonly wrenches = new Float64Array(24);
  /** Wrench without the governed axes (u = 0). */
  readonly baseWrench = this.wrenches.subarray(0, 6);
  /** B: wrench per unit of u_j, column j at [6j, 6j+6). */
  readonly inputWrench = this.wrenches.subarray(6, 24);
  /** Governed accelerations u = −K·z. */
  readonly input = new Float64Array(3);
  /** Measured velocities of the governed axes (v_x, v_y, ω_z world). */
  readonly measuredRate = new Float64Array(3);
  /** Gains per governed axis: K = [kp, kd] for x, y, yaw. */
  readonly stiffness = new Float64Array(3);
  readonly damping = new Float64Array(3);
  /**
   * (height k_p, height k_d, attitude k_p, attitude k_d). The hot path reads gains from typed
   * arrays, not from the options object: builds whose options hold a double where others hold a
   * small integer give that object's fields a generalised representation, and reads then box.
   */
  private readonly postureGains = new Float64Array(4);
  /** Rotation vector of the attitude error (kept in an array: see postureGains). */
  private readonly attitudeError = new Float64Array(3);

  constructor(robot: RobotParams, gravity: readonly number[], options: ReferenceOptions) {
    this.totalMass_kg = robot.trunk.mass_kg + robot.hips_m.length * robot.foot.mass_kg;
    this.gravity_mps2 = new Float64Array(gravity);
    this.options = options;
    this.stiffness[0] = options.positionGain_per_s2;
    this.stiffness[1] = options.positionGain_per_s2;
    this.stiffness[2] = options.attitudeGain_per_s2;
    this.damping[0] = options.velocityGain_per_s;
    this.damping[1] = options.velocityGain_per_s;
    this.damping[2] = options.attitudeDampingGain_per_s;
    this.postureGains[0] = options.heightGain_per_s2;
    this.postureGains[1] = options.heightDampingGain_per_s;
    this.postureGains[2] = options.attitudeGain_per_s2;
    this.postureGains[3] = options.attitudeDampingGain_per_s;
  }

  /**
   * Computes the error state against `reference` and the affine wrench split (baseWrench, B).
   * The velocity errors use reference.velocity_mps / yawRate_radps as they are now.
   */
  evaluate(obs: Observation, trunk: TrunkState, reference: TrunkReference): void {
    const k = this.postureGains, m = this.totalMass_kg, g = this.gravity_mps2;
    const v = obs.trunkVelocity_mps, w = trunk.angularVelocityWorld;
    this.evaluateError(obs, w, reference);
    const r = this.attitudeError, p = obs.trunkPosition_m;
    const rx = r[0], ry = r[1];

    const az = k[0] * (reference.position_m[2] - p[2]) - k[1] * v[2];
    const alphaX = k[2] * rx - k[3] * w[0];
    const alphaY = k[2] * ry - k[3] * w[1];
    const iw = trunk.inertiaWorld;
    // Gyroscopic term ω × I_w·ω.
    const hx = iw[0] * w[0] + iw[1] * w[1] + iw[2] * w[2];
    const hy = iw[3] * w[0] + iw[4] * w[1] + iw[5] * w[2];
    const hz = iw[6] * w[0] + iw[7] * w[1] + iw[8] * w[2];
    const b = this.baseWrench;
    b[0] = -m * g[0];
    b[1] = -m * g[1];
    b[2] = m * (az - g[2]);
    b[3] = iw[0] * alphaX + iw[1] * alphaY + (w[1] * hz - w[2] * hy);
    b[4] = iw[3] * alphaX + iw[4] * alphaY + (w[2] * hx - w[0] * hz);
    b[5] = iw[6] * alphaX + iw[7] * alphaY + (w[0] * hy - w[1] * hx);
    const c = this.inputWrench;
    // A loop, not c.fill(0): the builtin call costs more than the 18 stores.
    for (let e = 0; e < c.length; e++) c[e] = 0;
    c[0] = m;
    c[7] = m;
    c[15] = iw[2];
    c[16] = iw[5];
    c[17] = iw[8];
  }

  /**
   * The error state z (and u) alone, from the observation and the trunk's world angular velocity:
   * what the governor needs, without the wrench (Controller.governorUpdate uses this).
   */
  evaluateError(obs: Observation, angularVelocityWorld: Float64Array, reference: TrunkReference): void {
    const p = obs.trunkPosition_m, v = obs.trunkVelocity_mps, q = obs.trunkQuaternion;
    // Attitude error as a rotation vector of q_err = q_des ⊗ q̄, q_des = yaw-only reference.
    const half = 0.5 * reference.yaw_rad;
    const dw = Math.cos(half), dz = Math.sin(half);
    const qw = q[0], qx = -q[1], qy = -q[2], qz = -q[3];
    let ew = dw * qw - dz * qz;
    let ex = dw * qx - dz * qy;
    let ey = dw * qy + dz * qx;
    let ez = dw * qz + dz * qw;
    if (ew < 0) { ew = -ew; ex = -ex; ey = -ey; ez = -ez; }
    const sine = Math.sqrt(ex * ex + ey * ey + ez * ez);
    const scale = sine > 1e-12 ? (2 * Math.atan2(sine, ew)) / sine : 2;
    const r = this.attitudeError;
    r[0] = ex * scale;
    r[1] = ey * scale;
    r[2] = ez * scale;

    this.measuredRate[0] = v[0];
    this.measuredRate[1] = v[1];
    this.measuredRate[2] = angularVelocityWorld[2];
    const z = this.error;
    z[0] = p[0] - reference.position_m[0];
    z[2] = p[1] - reference.position_m[1];
    z[4] = -r[2];
    this.setVelocityReference(reference);
  }

  /**
   * Re-evaluates the velocity errors and u for the reference's applied velocity and yaw rate
   * (after the governor moved them). Takes the object, not three numbers: doubles passed to a
   * call V8 does not inline are boxed.
   */
  setVelocityReference(reference: TrunkReference): void {
    const z = this.error, r = this.measuredRate;
    z[1] = r[0] - reference.velocity_mps[0];
    z[3] = r[1] - reference.velocity_mps[1];
    z[5] = r[2] - reference.yawRate_radps;
    for (let axis = 0; axis < 3; axis++) {
      this.input[axis] = -this.stiffness[axis] * z[2 * axis] - this.damping[axis] * z[2 * axis + 1];
    }
  }

  /** w = baseWrench + B·u into out (6). */
  wrench(out: Float64Array): Float64Array {
    const b = this.baseWrench, c = this.inputWrench, u = this.input;
    for (let k = 0; k < 6; k++) out[k] = b[k] + c[k] * u[0] + c[6 + k] * u[1] + c[12 + k] * u[2];
    return out;
  }
}
