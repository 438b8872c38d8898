// Slip of loaded feet: slip distance ∫ |v_t| dt over loaded samples (rectangle rule, each sample
// weighted by its duration: one physics step in a run, one control period for a per-tick feed),
// and slip intervals where |v_t| exceeds the slip speed (edges counted per tick, intervals.ts).
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

  /** One control tick fed as a single sample (the plot-series recorder's per-tick view). */
  record(sample: TickSample): void {
    this.add(sample.footForce_N, sample.footVelocity_mps, sample.dt_s);
    this.endTick();
  }

  endTick(): void {
    for (let i = 0; i < this.footCount; i++) this.perFoot[i].endTick();
    this.union.endTick();
  }

  private add(force: Float64Array, velocity: Float64Array, dt_s: number): void {
    let any = false;
    for (let i = 0; i < this.footCount; i++) {
      let slipping = false;
      const loaded = force[3 * i + 2] > this.loadedThreshold_N;
      if (loaded) {
        const vx = velocity[3 * i];
        const vy = velocity[3 * i + 1];
        const speed_mps = Math.sqrt(vx * vx + vy * vy);
        this.distancePerFoot_m[i] += speed_mps * dt_s;
        slipping = speed_mps > this.slipSpeed_mps;
      }
      this.loaded[i] = loaded ? 1 : 0;
      this.sliding[i] = slipping ? 1 : 0;
      this.perFoot[i].step(slipping, dt_s);
      if (slipping) any = true;
    }
    this.union.step(any, dt_s);
  }
}
