// Raw log columns → the recorded trajectory: units to SI, quaternion to w-x-y-z (normalised),
// angles to a quaternion, body-frame trunk velocity to the world frame, foot force to the ground's
// force on the foot, foot velocity from positions when not logged. Values that cannot be what the
// map says are refused as unit mismatches (a quaternion far from unit length, "radians" beyond a
// full turn, a trunk height that only fits another length unit), naming a sample where it shows.

import { matrixFromQuaternion, quaternionFromRollPitchYaw } from '../plant/rotation.js';
import type { SlotLayout } from './layout.js';
import type { LoadedLogMap } from './map.js';
import type { RawLog } from './rawLog.js';
import { createTrajectory, type Trajectory } from '../scenario/trajectory.js';
import { UNIT_FACTORS, type Dimension } from './units.js';

export type ConvertResult = { ok: true; trajectory: Trajectory } | { ok: false; errors: string[] };

/** |q| outside this band is not a unit quaternion with rounding (common practice: loggers keep ~1e-6). */
const QUATERNION_NORM_BAND = [0.9, 1.1] as const;
/** Trunk heights beyond these multiples of the robot's standing height mean another length unit. */
const HEIGHT_RATIO_BAND = [0.2, 5] as const;

export function convertLog(raw: RawLog, loaded: LoadedLogMap, layout: SlotLayout): ConvertResult {
  const { map, robot } = loaded;
  const n = map.feet.length;
  const count = raw.count;
  const v = raw.values;
  const errors: string[] = [];
  const factor = (slot: number): number => {
    const s = layout.slots[slot];
    return s.dimension && s.unit ? UNIT_FACTORS[s.dimension as Dimension][s.unit] : 1;
  };

  const t0 = raw.time_s[0];
  const offset_s = map.time.offset_s ?? 0;
  const tr = createTrajectory(n, count, layout.externalForce !== null, -1);
  // Scenario time of a sample: its log time from the first sample, plus the map's offset (the
  // scenario time of the first sample, e.g. a recorder that starts a few ms after the run).
  for (let k = 0; k < count; k++) tr.t_s[k] = raw.time_s[k] - t0 + offset_s;

  const o = map.trunk.orientation;
  const q = new Float64Array(4);
  const R = new Float64Array(9);
  const angleFactor = o.kind === 'rpy' ? UNIT_FACTORS.angle[o.unit!] : 1;
  const fp = factor(layout.trunkPosition);
  const fv = factor(layout.trunkVelocity);
  let heightSum = 0;
  for (let k = 0; k < count; k++) {
    for (let c = 0; c < 3; c++) tr.trunkPosition_m[3 * k + c] = v[layout.trunkPosition + c][k] * fp;
    heightSum += tr.trunkPosition_m[3 * k + 2];
    if (o.kind === 'quaternion') {
      const first = layout.trunkOrientation;
      const xyzw = o.order === 'xyzw';
      q[0] = v[first + (xyzw ? 3 : 0)][k];
      q[1] = v[first + (xyzw ? 0 : 1)][k];
      q[2] = v[first + (xyzw ? 1 : 2)][k];
      q[3] = v[first + (xyzw ? 2 : 3)][k];
      const norm = Math.hypot(q[0], q[1], q[2], q[3]);
      if (!(norm >= QUATERNION_NORM_BAND[0] && norm <= QUATERNION_NORM_BAND[1])) {
        if (errors.length < 5) errors.push(`${raw.where(k)}: unit mismatch: trunk orientation (${[...q].map((x) => +x.toFixed(4)).join(', ')}) has norm ${norm.toFixed(3)} (expected a unit quaternion; angles go with kind: rpy) (map: ${loaded.where('/trunk/orientation')})`);
        continue;
      }
      for (let c = 0; c < 4; c++) q[c] /= norm;
    } else {
      const first = layout.trunkOrientation;
      const roll = v[first][k] * angleFactor;
      const pitch = v[first + 1][k] * angleFactor;
      const yaw = v[first + 2][k] * angleFactor;
      if (o.unit === 'rad' && Math.max(Math.abs(roll), Math.abs(pitch), Math.abs(yaw)) > 2 * Math.PI + 1e-6 && errors.length < 5) {
        errors.push(`${raw.where(k)}: unit mismatch: trunk angles (${v[first][k]}, ${v[first + 1][k]}, ${v[first + 2][k]}) exceed a full turn in rad (are they degrees? the map says unit: rad at ${loaded.where('/trunk/orientation/unit')})`);
      }
      quaternionFromRollPitchYaw(q, roll, pitch, yaw);
    }
    // A unit quaternion and its negative are one rotation; keep w ≥ 0 so the file has one spelling.
    const sign = q[0] < 0 ? -1 : 1;
    for (let c = 0; c < 4; c++) tr.trunkQuaternion[4 * k + c] = sign * q[c] + 0;
    const vx = v[layout.trunkVelocity][k] * fv;
    const vy = v[layout.trunkVelocity + 1][k] * fv;
    const vz = v[layout.trunkVelocity + 2][k] * fv;
    if (map.trunk.velocity.frame === 'body') {
      matrixFromQuaternion(R, tr.trunkQuaternion.subarray(4 * k, 4 * k + 4));
      tr.trunkVelocity_mps[3 * k] = R[0] * vx + R[1] * vy + R[2] * vz;
      tr.trunkVelocity_mps[3 * k + 1] = R[3] * vx + R[4] * vy + R[5] * vz;
      tr.trunkVelocity_mps[3 * k + 2] = R[6] * vx + R[7] * vy + R[8] * vz;
    } else {
      tr.trunkVelocity_mps[3 * k] = vx;
      tr.trunkVelocity_mps[3 * k + 1] = vy;
      tr.trunkVelocity_mps[3 * k + 2] = vz;
    }
  }
  const meanHeight = heightSum / count;
  const ratio = meanHeight / robot.standingHeight_m;
  if (!(ratio >= HEIGHT_RATIO_BAND[0] && ratio <= HEIGHT_RATIO_BAND[1])) {
    errors.push(
      `${raw.display}: unit mismatch: the mean trunk height reads ${meanHeight.toPrecision(4)} m with unit: ${map.trunk.position.unit}, ` +
        `but robot ${robot.id} stands at ${robot.standingHeight_m} m (expected the unit the log uses; map: ${loaded.where('/trunk/position/unit')})`,
    );
  }

  layout.feet.forEach((foot, i) => {
    const f = factor(foot.position);
    const ff = factor(foot.force) * (map.foot[map.feet[i]].force.sign === 'footOnGround' ? -1 : 1);
    const fvel = foot.velocity !== null ? factor(foot.velocity) : 0;
    for (let k = 0; k < count; k++) {
      const j = 3 * (n * k + i);
      for (let c = 0; c < 3; c++) {
        tr.footPosition_m[j + c] = v[foot.position + c][k] * f;
        tr.footForce_N[j + c] = v[foot.force + c][k] * ff + 0;
        if (foot.velocity !== null) tr.footVelocity_mps[j + c] = v[foot.velocity + c][k] * fvel;
      }
      if (foot.contact !== null) tr.contact[n * k + i] = v[foot.contact][k] !== 0 ? 1 : 0;
    }
    if (foot.velocity === null) differentiateFoot(tr, i);
  });

  const fc = factor(layout.commandVelocity);
  const fy = factor(layout.commandYawRate);
  for (let k = 0; k < count; k++) {
    tr.commandVelocity_mps[2 * k] = v[layout.commandVelocity][k] * fc + 0;
    tr.commandVelocity_mps[2 * k + 1] = v[layout.commandVelocity + 1][k] * fc + 0;
    tr.commandYawRate_radps[k] = v[layout.commandYawRate][k] * fy + 0;
    if (layout.commandGait !== null) tr.commandGait[k] = v[layout.commandGait][k];
  }
  if (tr.externalForce_N) {
    const fe = factor(layout.externalForce!);
    for (let k = 0; k < count; k++) for (let c = 0; c < 3; c++) tr.externalForce_N[3 * k + c] = v[layout.externalForce! + c][k] * fe + 0;
  }
  return errors.length ? { ok: false, errors } : { ok: true, trajectory: tr };
}

/** Central differences of foot i's positions (one-sided at the ends). */
function differentiateFoot(tr: Trajectory, i: number): void {
  const n = tr.footCount;
  for (let k = 0; k < tr.count; k++) {
    const a = k > 0 ? k - 1 : k;
    const b = k + 1 < tr.count ? k + 1 : k;
    const dt = tr.t_s[b] - tr.t_s[a];
    for (let c = 0; c < 3; c++) tr.footVelocity_mps[3 * (n * k + i) + c] = (tr.footPosition_m[3 * (n * b + i) + c] - tr.footPosition_m[3 * (n * a + i) + c]) / dt;
  }
}
