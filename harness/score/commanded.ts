// Commanded cone violations: a stance foot whose *wanted* ground force (the build's action) lies
// outside the true friction cone, |w_t| > μs·w_z, or pulls on the ground, w_z < 0. This is what the
// controller asked for, independent of what the plant could deliver, so it catches an
// over-trusting controller before the robot slides. Checked every physics step: the action is held
// over the tick, the true μs under a moving foot is not.

import { STANCE } from '../contract/tick.js';
import { IntervalCounter } from './intervals.js';
import type { HeldAction, StepView } from './sample.js';
import { CONE_TOLERANCE_N } from './thresholds.js';

export function wantedForceOutsideCone(wx_N: number, wy_N: number, wz_N: number, staticFriction: number): boolean {
  if (wz_N < -CONE_TOLERANCE_N) return true;
  return Math.sqrt(wx_N * wx_N + wy_N * wy_N) - staticFriction * wz_N > CONE_TOLERANCE_N;
}

export class CommandedViolationTracker {
  /** Intervals in which any stance foot violates (the union over feet). */
  readonly union = new IntervalCounter();
  readonly perFoot: IntervalCounter[] = [];

  constructor(private readonly footCount: number) {
    for (let i = 0; i < footCount; i++) this.perFoot.push(new IntervalCounter());
  }

  recordStep(step: StepView, held: HeldAction): void {
    const wanted = held.wantedForce_N;
    const friction = step.footStaticFriction;
    const dt_s = step.lastStep_s;
    let any = false;
    for (let i = 0; i < this.footCount; i++) {
      const violating =
        held.mode[i] === STANCE &&
        wantedForceOutsideCone(wanted[3 * i], wanted[3 * i + 1], wanted[3 * i + 2], friction[i]);
      this.perFoot[i].step(violating, dt_s);
      if (violating) any = true;
    }
    this.union.step(any, dt_s);
  }

  endTick(): void {
    for (let i = 0; i < this.footCount; i++) this.perFoot[i].endTick();
    this.union.endTick();
  }
}
