// A standing controller as an in-process build module:
//   footing run … --build 'stand=examples/typescript/stand_controller.ts'
//
// The same logic as examples/python/stand_controller.py, with the same floating-point operations
// in the same order, so a process build and an in-process build of it give the same actions (the
// protocol test compares them). Every foot is in stance; each foot's wanted ground force is an
// even share of the weight along −gravity and of a PD force on trunk height (plus a horizontal
// velocity damper), plus its part of a PD torque on trunk attitude spread by lever arm; the legs
// hold a small impedance toward the standing foot position below each hip. tick allocates nothing.

import type { Action, Controller, ControllerSetup, Observation } from 'footing';

export const TELEMETRY_NAMES = ['stand.heightError_m', 'stand.tiltError'] as const;

function option(options: Record<string, unknown>, key: string, fallback: number): number {
  const value = options[key] ?? fallback;
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new Error(`stand_controller: option ${key} = ${JSON.stringify(value)}: expected a finite number`);
  }
  return value;
}

export function createController(setup: ControllerSetup): Controller {
  const robot = setup.robot;
  const n = robot.hips_m.length;
  const mass_kg = robot.trunk.mass_kg + n * robot.foot.mass_kg;
  const g = setup.gravity_mps2;
  const gNorm = Math.sqrt(g[0] * g[0] + g[1] * g[1] + g[2] * g[2]);
  const up = [-g[0] / gNorm, -g[1] / gNorm, -g[2] / gNorm];
  const height_m = robot.standingHeight_m;
  const inertia = robot.trunk.inertia_kgm2;
  const inertia_kgm2 = (inertia[0][0] + inertia[1][1]) / 2;

  // k = M·ω², d = 2·ζ·M·ω for a second-order response of natural frequency ω (common practice).
  const heightOmega = 2 * Math.PI * option(setup.options, 'heightFrequency_Hz', 3.0);
  const attitudeOmega = 2 * Math.PI * option(setup.options, 'attitudeFrequency_Hz', 3.0);
  const zeta = option(setup.options, 'dampingRatio', 1.0);
  const heightKp = mass_kg * heightOmega * heightOmega;
  const heightKd = 2 * zeta * mass_kg * heightOmega;
  const attitudeKp = inertia_kgm2 * attitudeOmega * attitudeOmega;
  const attitudeKd = 2 * zeta * inertia_kgm2 * attitudeOmega;
  const horizontalKd = option(setup.options, 'horizontalDamping_per_s', 2.0) * mass_kg;
  const legStiffness = option(setup.options, 'legStiffness_N_per_m', 200.0);
  const legDamping = option(setup.options, 'legDamping_Ns_per_m', 5.0);

  const footTarget = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) footTarget[3 * i + 2] = -(height_m + robot.hips_m[i][2]);

  return {
    telemetryNames: TELEMETRY_NAMES,
    tick(obs: Observation, action: Action): void {
      const p = obs.trunkPosition_m;
      const v = obs.trunkVelocity_mps;
      const q = obs.trunkQuaternion;
      const qw = q[0];
      const qx = q[1];
      const qy = q[2];
      const qz = q[3];
      const wb = obs.trunkAngularVelocity_radps;
      const feet = obs.footPosition_m;

      const r00 = 1 - 2 * (qy * qy + qz * qz);
      const r01 = 2 * (qx * qy - qw * qz);
      const r02 = 2 * (qx * qz + qw * qy);
      const r10 = 2 * (qx * qy + qw * qz);
      const r11 = 1 - 2 * (qx * qx + qz * qz);
      const r12 = 2 * (qy * qz - qw * qx);
      const r20 = 2 * (qx * qz - qw * qy);
      const r21 = 2 * (qy * qz + qw * qx);
      const r22 = 1 - 2 * (qx * qx + qy * qy);
      const wx = r00 * wb[0] + r01 * wb[1] + r02 * wb[2];
      const wy = r10 * wb[0] + r11 * wb[1] + r12 * wb[2];
      const wz = r20 * wb[0] + r21 * wb[1] + r22 * wb[2];

      // Tilt error: trunk z axis × up, the axis that rights the trunk, of length sin(tilt).
      const ex = r12 * up[2] - r22 * up[1];
      const ey = r22 * up[0] - r02 * up[2];
      const ez = r02 * up[1] - r12 * up[0];
      const tx = attitudeKp * ex - attitudeKd * wx;
      const ty = attitudeKp * ey - attitudeKd * wy;
      const tz = attitudeKp * ez - attitudeKd * wz;

      const heightError = height_m - p[2];
      const fx = -mass_kg * g[0] - horizontalKd * v[0];
      const fy = -mass_kg * g[1] - horizontalKd * v[1];
      const fz = -mass_kg * g[2] + (heightKp * heightError - heightKd * v[2]);

      let leverSum = 0.0;
      for (let i = 0; i < n; i++) {
        const rx = feet[3 * i] - p[0];
        const ry = feet[3 * i + 1] - p[1];
        const rz = feet[3 * i + 2] - p[2];
        leverSum += rx * rx + ry * ry + rz * rz;
      }

      // f_i = F/N + (τ × r_i)/Σ|r|²: a plain spread by lever arm. It yields the moment
      // τ·Σ|r|² − Σ r·rᵀ·τ over Σ|r|², so only part of τ; the PD gains absorb the difference.
      // (With centred feet Σ τ × r_i = 0, so the total force stays F.)
      const force = action.groundForce_N;
      for (let i = 0; i < n; i++) {
        const rx = feet[3 * i] - p[0];
        const ry = feet[3 * i + 1] - p[1];
        const rz = feet[3 * i + 2] - p[2];
        force[3 * i] = fx / n + (ty * rz - tz * ry) / leverSum;
        force[3 * i + 1] = fy / n + (tz * rx - tx * rz) / leverSum;
        force[3 * i + 2] = fz / n + (tx * ry - ty * rx) / leverSum;
        action.mode[i] = 1;
        action.stiffness_N_per_m[i] = legStiffness;
        action.damping_Ns_per_m[i] = legDamping;
      }
      action.footTarget_m.set(footTarget);
      action.footTargetVelocity_mps.fill(0);
      action.telemetry[0] = heightError;
      action.telemetry[1] = Math.sqrt(ex * ex + ey * ey + ez * ez);
    },
  };
}
