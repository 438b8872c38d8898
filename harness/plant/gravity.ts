// The ground is always the plane z = 0 of the world frame; an incline tilts gravity instead, so the
// friction map, footholds and the scorer's normal/tangential split stay in plain x, y, z.

import { STANDARD_GRAVITY_mps2 } from './defaults.js';

/**
 * Gravity in the ground-aligned world frame for a slope of `pitch_deg` (ground rises toward +x)
 * and `roll_deg` (ground rises toward +y). |g| stays standard gravity.
 */
export function gravityOnIncline(out: Float64Array, pitch_deg: number, roll_deg: number): Float64Array {
  const pitch = (pitch_deg * Math.PI) / 180;
  const roll = (roll_deg * Math.PI) / 180;
  out[0] = -STANDARD_GRAVITY_mps2 * Math.sin(pitch);
  out[1] = -STANDARD_GRAVITY_mps2 * Math.cos(pitch) * Math.sin(roll);
  out[2] = -STANDARD_GRAVITY_mps2 * Math.cos(pitch) * Math.cos(roll);
  return out;
}
