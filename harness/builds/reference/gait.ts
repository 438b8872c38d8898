// Phase scheduler for the stand and trot gaits. A trot moves the diagonal pairs FL+HR and FR+HL
// half a period apart (foot order FL, FR, HL, HR as in harness/plant/types.ts). A leg's local
// phase ψ = (φ + offset) mod 1 is in stance while ψ < dutyFactor and in swing after it.
//
// Starting: the clock starts at φ = 0, so pair FL+HR begins a full stance and pair FR+HL, already
// planted, lifts after (dutyFactor − ½)·period of four-foot support: the first lift-off happens
// with all feet down and loaded. Stopping: when the command returns to stand, the clock keeps
// running until a touchdown (or a tick with every foot in stance), then freezes with all feet down,
// so a swing foot is never dropped mid-air.

import { STANCE, SWING, type GaitName } from '../interface.js';

/** Phase offsets of the trot's diagonal pairs, indexed by foot (FL, FR, HL, HR). */
export const TROT_OFFSETS: readonly number[] = [0, 0.5, 0.5, 0];

export class GaitScheduler {
  readonly legCount: number;
  readonly period_s: number;
  readonly dutyFactor: number;
  readonly stance_s: number;
  readonly swing_s: number;
  /** STANCE or SWING per leg, for the current tick. */
  readonly mode: Uint8Array;
  /** Swing progress s ∈ [0, 1] per leg (0 in stance). */
  readonly swingProgress: Float64Array;
  /** Time left until touchdown per leg (0 in stance). */
  readonly swingRemaining_s: Float64Array;
  /** 1 on the tick a leg went stance → swing / swing → stance. */
  readonly liftOff: Uint8Array;
  readonly touchDown: Uint8Array;
  /** Gait clock φ ∈ [0, 1). */
  phase = 0;
  trotting = false;

  /** The control period: update() advances the clock by this much. */
  readonly step_s: number;

  constructor(legCount: number, period_s: number, dutyFactor: number, step_s: number) {
    this.step_s = step_s;
    if (legCount !== TROT_OFFSETS.length) {
      throw new Error(`gait scheduler: the reference builds drive ${TROT_OFFSETS.length} legs, robot has ${legCount}`);
    }
    if (!(period_s > 0) || !Number.isFinite(period_s)) {
      throw new Error(`gait scheduler: robot.gait.period_s = ${period_s}, expected a positive number`);
    }
    if (!(dutyFactor >= 0.5 && dutyFactor < 1)) {
      throw new Error(`gait scheduler: robot.gait.dutyFactor = ${dutyFactor}, expected 0.5 ≤ dutyFactor < 1 for a trot`);
    }
    this.legCount = legCount;
    this.period_s = period_s;
    this.dutyFactor = dutyFactor;
    this.stance_s = dutyFactor * period_s;
    this.swing_s = (1 - dutyFactor) * period_s;
    this.mode = new Uint8Array(legCount).fill(STANCE);
    this.swingProgress = new Float64Array(legCount);
    this.swingRemaining_s = new Float64Array(legCount);
    this.liftOff = new Uint8Array(legCount);
    this.touchDown = new Uint8Array(legCount);
  }

  /** Advance by one control period under the commanded gait and refresh every per-leg field. */
  update(gait: GaitName): void {
    const legs = this.legCount;
    // Element loops, not TypedArray.fill: for four legs the builtin call costs more than the
    // stores (profiled, a few per cent of a tick).
    for (let i = 0; i < legs; i++) {
      this.liftOff[i] = 0;
      this.touchDown[i] = 0;
    }
    if (!this.trotting) {
      if (gait !== 'trot') {
        this.standStill();
        return;
      }
      this.trotting = true;
      this.phase = 0;
    } else {
      this.phase += this.step_s / this.period_s;
      this.phase -= Math.floor(this.phase);
    }
    let swinging = 0;
    let touchedDown = 0;
    for (let i = 0; i < this.legCount; i++) {
      let local = this.phase + TROT_OFFSETS[i];
      local -= Math.floor(local);
      const mode = local < this.dutyFactor ? STANCE : SWING;
      if (mode === SWING && this.mode[i] === STANCE) this.liftOff[i] = 1;
      if (mode === STANCE && this.mode[i] === SWING) {
        this.touchDown[i] = 1;
        touchedDown++;
      }
      this.mode[i] = mode;
      if (mode === SWING) {
        swinging++;
        const s = (local - this.dutyFactor) / (1 - this.dutyFactor);
        this.swingProgress[i] = s;
        this.swingRemaining_s[i] = (1 - s) * this.swing_s;
      } else {
        this.swingProgress[i] = 0;
        this.swingRemaining_s[i] = 0;
      }
    }
    if (gait !== 'trot') this.tryStop(swinging, touchedDown);
  }

  /** Freeze into stand once no foot is in the air except ones lifting this very tick. */
  private tryStop(swinging: number, touchedDown: number): void {
    let justLifted = 0;
    for (let i = 0; i < this.legCount; i++) justLifted += this.liftOff[i];
    if (swinging !== 0 && !(touchedDown > 0 && justLifted === swinging)) return;
    this.trotting = false;
    for (let i = 0; i < this.legCount; i++) this.liftOff[i] = 0;
    this.standStill();
  }

  /** Every leg in stance with no swing progress (stand, and the tick a trot stops). */
  private standStill(): void {
    for (let i = 0; i < this.legCount; i++) {
      this.mode[i] = STANCE;
      this.swingProgress[i] = 0;
      this.swingRemaining_s[i] = 0;
    }
  }

  /** Number of legs in stance this tick. */
  stanceCount(): number {
    let n = 0;
    for (let i = 0; i < this.legCount; i++) n += this.mode[i];
    return n;
  }
}
