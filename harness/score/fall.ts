// Fall detection, latched at the first physics step any test holds: the trunk touches the ground, its up
// axis is tilted more than FALL_TILT_deg from the ground normal (world +z), or its centre is below
// FALL_HEIGHT_FRACTION of the standing height.

import type { StepView } from './sample.js';
import { FALL_HEIGHT_FRACTION, FALL_TILT_deg } from './thresholds.js';
import type { FallReason } from './types.js';

const COS_FALL_TILT = Math.cos((FALL_TILT_deg * Math.PI) / 180);

/**
 * z component of the trunk's up axis in the world, for a (w, x, y, z) quaternion that need not be
 * normalised: R₃₃ = (w² − x² − y² + z²) / |q|² (the rotation matrix of a unit quaternion).
 */
export function upAxisZ(q: Float64Array): number {
  const w = q[0];
  const x = q[1];
  const y = q[2];
  const z = q[3];
  const norm2 = w * w + x * x + y * y + z * z;
  return norm2 > 0 ? (w * w - x * x - y * y + z * z) / norm2 : 1;
}

export class FallDetector {
  fallen = false;
  fellAt_s: number | null = null;
  reason: FallReason | null = null;
  private readonly minHeight_m: number;

  constructor(standingHeight_m: number) {
    this.minHeight_m = FALL_HEIGHT_FRACTION * standingHeight_m;
  }

  record(sample: StepView): void {
    if (this.fallen) return;
    let reason: FallReason | null = null;
    if (sample.trunkGroundForce_N > 0) reason = 'trunkContact';
    else if (upAxisZ(sample.trunkQuaternion) < COS_FALL_TILT) reason = 'trunkTilted';
    else if (sample.trunkPosition_m[2] < this.minHeight_m) reason = 'trunkLow';
    if (reason === null) return;
    this.fallen = true;
    this.fellAt_s = sample.time_s;
    this.reason = reason;
  }
}
