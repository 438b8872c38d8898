// Tracking of the commanded motion, horizontally (the ground plane):
// - trackingRms_m: √(∫ d² dt / ∫ dt), d = |trunk_xy − reference_xy| per tick;
// - progress: the trunk's travel from the first to the last scored tick, projected on the
//   direction of the travel the scenario's commands ask for over its whole duration, divided by
//   that travel's length. A run stopped early by a fall is thus measured against the full request.

import type { CommandStep } from '../scenario/types.js';
import type { TickSample } from './sample.js';
import { MIN_COMMANDED_TRAVEL_m } from './thresholds.js';

/** ∫₀^duration of the piecewise-constant commanded velocity (x, y); zero before the first step. */
export function commandedTravel_m(commands: readonly CommandStep[], duration_s: number): [number, number] {
  const steps = [...commands].sort((a, b) => a.at_s - b.at_s);
  let x = 0;
  let y = 0;
  for (let k = 0; k < steps.length; k++) {
    const start_s = Math.max(0, steps[k].at_s);
    const end_s = Math.min(duration_s, k + 1 < steps.length ? steps[k + 1].at_s : duration_s);
    if (end_s <= start_s) continue;
    x += steps[k].velocity_mps[0] * (end_s - start_s);
    y += steps[k].velocity_mps[1] * (end_s - start_s);
  }
  return [x, y];
}

export class TrackingTracker {
  private sumSquares_m2s = 0;
  private sumTime_s = 0;
  private ticks = 0;
  private startX_m = 0;
  private startY_m = 0;
  private lastX_m = 0;
  private lastY_m = 0;
  private readonly directionX: number;
  private readonly directionY: number;
  readonly commandedLength_m: number;

  constructor(commandedTravel: [number, number]) {
    this.commandedLength_m = Math.hypot(commandedTravel[0], commandedTravel[1]);
    const length = this.commandedLength_m > 0 ? this.commandedLength_m : 1;
    this.directionX = commandedTravel[0] / length;
    this.directionY = commandedTravel[1] / length;
  }

  record(sample: TickSample): void {
    const x = sample.trunkPosition_m[0];
    const y = sample.trunkPosition_m[1];
    if (this.ticks === 0) {
      this.startX_m = x;
      this.startY_m = y;
    }
    this.ticks++;
    this.lastX_m = x;
    this.lastY_m = y;
    const dx = x - sample.referencePosition_m[0];
    const dy = y - sample.referencePosition_m[1];
    this.sumSquares_m2s += (dx * dx + dy * dy) * sample.dt_s;
    this.sumTime_s += sample.dt_s;
  }

  rms_m(): number | null {
    return this.sumTime_s > 0 ? Math.sqrt(this.sumSquares_m2s / this.sumTime_s) : null;
  }

  progress(): number | null {
    if (this.commandedLength_m < MIN_COMMANDED_TRAVEL_m || this.ticks === 0) return null;
    const along_m =
      (this.lastX_m - this.startX_m) * this.directionX + (this.lastY_m - this.startY_m) * this.directionY;
    return along_m / this.commandedLength_m;
  }
}
