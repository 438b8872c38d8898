// Slip of loaded feet: slip distance ∫ |v_t| dt over loaded samples (rectangle rule with the
// control period, the sample's weight), and slip intervals where |v_t| exceeds the slip speed.
// v_t is the foot velocity's (x, y) part, tangential to the ground plane z = 0.

import { IntervalCounter } from './intervals.js';
import type { TickSample } from './sample.js';

export class SlipTracker {
  readonly union = new IntervalCounter();
  readonly perFoot: IntervalCounter[] = [];
  readonly distancePerFoot_m: Float64Array;
  /** Per foot, at the last sample: 1 when loaded (normal force above the threshold). */
  readonly loaded: Uint8Array;
  /** Per foot, at the last sample: 1 when loaded and sliding faster than the slip speed. */
  readonly sliding: Uint8Array;

  constructor(
    private readonly footCount: number,
    private readonly loadedThreshold_N: number,
    private readonly slipSpeed_mps: number,
  ) {
    this.distancePerFoot_m = new Float64Array(footCount);
    this.loaded = new Uint8Array(footCount);
    this.sliding = new Uint8Array(footCount);
    for (let i = 0; i < footCount; i++) this.perFoot.push(new IntervalCounter());
  }

  record(sample: TickSample): void {
    const force = sample.footForce_N;
    const velocity = sample.footVelocity_mps;
    let any = false;
    for (let i = 0; i < this.footCount; i++) {
      let slipping = false;
      const loaded = force[3 * i + 2] > this.loadedThreshold_N;
      if (loaded) {
        const vx = velocity[3 * i];
        const vy = velocity[3 * i + 1];
        const speed_mps = Math.sqrt(vx * vx + vy * vy);
        this.distancePerFoot_m[i] += speed_mps * sample.dt_s;
        slipping = speed_mps > this.slipSpeed_mps;
      }
      this.loaded[i] = loaded ? 1 : 0;
      this.sliding[i] = slipping ? 1 : 0;
      this.perFoot[i].update(slipping, sample.dt_s);
      if (slipping) any = true;
    }
    this.union.update(any, sample.dt_s);
  }

  totalDistance_m(): number {
    let total = 0;
    for (let i = 0; i < this.footCount; i++) total += this.distancePerFoot_m[i];
    return total;
  }
}
