// Quaternion and rotation helpers in out-parameter style (receiving array first, no allocation).
// Quaternions are (w, x, y, z) and rotate trunk-frame vectors into the world frame.

/** Rotation matrix of unit quaternion q (row-major 3×3) into out. */
export function matrixFromQuaternion(out: Float64Array, q: Float64Array): Float64Array {
  const w = q[0];
  const x = q[1];
  const y = q[2];
  const z = q[3];
  out[0] = 1 - 2 * (y * y + z * z);
  out[1] = 2 * (x * y - w * z);
  out[2] = 2 * (x * z + w * y);
  out[3] = 2 * (x * y + w * z);
  out[4] = 1 - 2 * (x * x + z * z);
  out[5] = 2 * (y * z - w * x);
  out[6] = 2 * (x * z - w * y);
  out[7] = 2 * (y * z + w * x);
  out[8] = 1 - 2 * (x * x + y * y);
  return out;
}

/** Quaternion of intrinsic Z-Y-X (yaw, pitch, roll) angles in radians. */
export function quaternionFromRollPitchYaw(
  out: Float64Array,
  roll: number,
  pitch: number,
  yaw: number,
): Float64Array {
  const cr = Math.cos(roll / 2);
  const sr = Math.sin(roll / 2);
  const cp = Math.cos(pitch / 2);
  const sp = Math.sin(pitch / 2);
  const cy = Math.cos(yaw / 2);
  const sy = Math.sin(yaw / 2);
  out[0] = cr * cp * cy + sr * sp * sy;
  out[1] = sr * cp * cy - cr * sp * sy;
  out[2] = cr * sp * cy + sr * cp * sy;
  out[3] = cr * cp * sy - sr * sp * cy;
  return out;
}

/** Roll, pitch, yaw (Z-Y-X) of quaternion q into out (3), radians. */
export function rollPitchYawFromQuaternion(out: Float64Array, q: Float64Array): Float64Array {
  const w = q[0];
  const x = q[1];
  const y = q[2];
  const z = q[3];
  out[0] = Math.atan2(2 * (w * x + y * z), 1 - 2 * (x * x + y * y));
  const s = 2 * (w * y - z * x);
  out[1] = Math.asin(s > 1 ? 1 : s < -1 ? -1 : s);
  out[2] = Math.atan2(2 * (w * z + x * y), 1 - 2 * (y * y + z * z));
  return out;
}

/** Inverse of a symmetric positive-definite 3×3 matrix (row-major) into out. */
export function invertSymmetric3(out: Float64Array, m: Float64Array): Float64Array {
  const a = m[0], b = m[1], c = m[2];
  const d = m[4], e = m[5], f = m[8];
  const A = d * f - e * e;
  const B = c * e - b * f;
  const C = b * e - c * d;
  const det = a * A + b * B + c * C;
  out[0] = A / det;
  out[1] = B / det;
  out[2] = C / det;
  out[3] = B / det;
  out[4] = (a * f - c * c) / det;
  out[5] = (b * c - a * e) / det;
  out[6] = C / det;
  out[7] = (b * c - a * e) / det;
  out[8] = (a * d - b * b) / det;
  return out;
}
