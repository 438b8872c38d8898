// The scorer's pass over one physics step: a single loop over the feet that reads each foot's
// force, velocity and friction once and updates every per-step score with them — friction margin,
// touchdown / stance split, commanded cone violations, slip — then the fall test. Written as one
// loop because the separate trackers' loops each reloaded the step's arrays and repeated the same
// square roots (a loaded foot's tangential speed served touchdown and slip; the wanted force's
// tangential part is fixed over a tick): 2× the plant's own step cost before (docs/bench.md).
// The laws are unchanged and each is stated where it is applied; the trackers own their state and
// turn it into metrics (frictionMargin.ts, touchdown.ts, intervals.ts, fall.ts).

import { STANCE } from '../contract/tick.js';
import { FallDetector } from './fall.js';
import { FrictionMarginTracker } from './frictionMargin.js';
import type { Histogram } from './histogram.js';
import { IntervalBank } from './intervals.js';
import type { HeldAction, StepView } from './sample.js';
import { CONE_TOLERANCE_N, MARGIN_BIN_WIDTH, MARGIN_FLOOR } from './thresholds.js';
import { PEAK, SLIP, TouchdownTracker, VALUES } from './touchdown.js';

export interface StepPassOptions {
  footCount: number;
  loadedThreshold_N: number;
  slipSpeed_mps: number;
  touchdownTransient_s: number;
  duration_s: number;
  settledStart: boolean;
  standingHeight_m: number;
}

export class StepPass {
  /** Friction margin of the loaded samples outside stance, per foot (with the stance ones: the margin). */
  readonly margin: FrictionMarginTracker;
  readonly touchdown: TouchdownTracker;
  /** Commanded violations: channel i is foot i, channel footCount the union over feet. */
  readonly commanded: IntervalBank;
  /** Slip intervals (loaded and faster than the slip speed), channels as `commanded`. */
  readonly slip: IntervalBank;
  /** ∫ |v_t| dt over each foot's loaded samples. */
  readonly slipDistance_m: Float64Array;
  readonly fall: FallDetector;

  private readonly footCount: number;
  private readonly loadedThreshold_N: number;
  private readonly slipSpeed_mps: number;
  private readonly outsideStanceHistograms: Histogram[];
  private readonly stanceHistograms: Histogram[];
  private readonly lastBin: number;
  /** Constants read once: an imported binding read in the loop cost a heap number per foot (measured). */
  private readonly floor: number = MARGIN_FLOOR;
  private readonly binWidth: number = MARGIN_BIN_WIDTH;
  private readonly coneTolerance_N: number = CONE_TOLERANCE_N;
  /** This step's margin and bin per loaded foot, and its weight: they cross the histogram call in arrays, unboxed. */
  private readonly margins: Float64Array;
  private readonly bins: Int32Array;
  private readonly weight = new Float64Array(1);
  /** |w_t| of each foot's wanted force, taken at the tick's first step (the action is held over the tick). */
  private readonly wantedTangential_N: Float64Array;
  private tickStarts = true;

  constructor(options: StepPassOptions) {
    const n = options.footCount;
    this.footCount = n;
    this.loadedThreshold_N = options.loadedThreshold_N;
    this.slipSpeed_mps = options.slipSpeed_mps;
    this.margin = new FrictionMarginTracker(n);
    this.touchdown = new TouchdownTracker(n, options.touchdownTransient_s, options.duration_s, options.settledStart);
    this.commanded = new IntervalBank(n + 1);
    this.slip = new IntervalBank(n + 1);
    this.slipDistance_m = new Float64Array(n);
    this.fall = new FallDetector(options.standingHeight_m);
    this.outsideStanceHistograms = this.margin.outsideStance;
    this.stanceHistograms = this.touchdown.stance;
    this.lastBin = this.stanceHistograms[0].counts.length - 1;
    this.margins = new Float64Array(n);
    this.bins = new Int32Array(n);
    this.wantedTangential_N = new Float64Array(n);
  }

  recordStep(step: StepView, held: HeldAction): void {
    const n = this.footCount;
    const force = step.footGroundForce_N;
    const velocity = step.footVelocity_mps;
    const friction = step.footStaticFriction;
    const mode = held.mode;
    const wanted = held.wantedForce_N;
    const time_s = step.time_s;
    const h = step.lastStep_s;
    this.weight[0] = step.stepWeight;
    const threshold_N = this.loadedThreshold_N;
    const td = this.touchdown;
    // Half a physics step of slack: the transient holds exactly transient_s / step samples.
    const closeAfter_s = td.transient_s - 0.5 * step.step_s;
    if (this.tickStarts) {
      this.tickStarts = false;
      for (let i = 0; i < n; i++) {
        const wx = wanted[3 * i];
        const wy = wanted[3 * i + 1];
        this.wantedTangential_N[i] = Math.sqrt(wx * wx + wy * wy);
      }
    }
    let anyCommanded = false;
    let anySlip = false;
    for (let i = 0; i < n; i++) {
      const a = 3 * i;
      const fz = force[a + 2];
      const vx = velocity[a];
      const vy = velocity[a + 1];

      // Touchdown bookkeeping: in contact exactly when the ground pushes (the plant's own test);
      // the landing speeds are taken at the first step in contact.
      if (!(fz > 0)) {
        td.airborne[i] = 1;
        td.wasInContact[i] = 0;
      } else if (td.wasInContact[i] === 0) {
        td.wasInContact[i] = 1;
        td.landing[2 * i] = Math.sqrt(vx * vx + vy * vy);
        td.landing[2 * i + 1] = -velocity[a + 2];
      }
      if (td.inTransient[i] === 1 && time_s - td.transientStart_s[i] > closeAfter_s) td.closeTouchdown(i);

      // Commanded violation: a stance foot whose *wanted* ground force (the build's action) lies
      // outside the true friction cone, |w_t| > μs·w_z, or pulls on the ground, w_z < 0 — what
      // the controller asked for, whatever the plant could deliver, so it catches an
      // over-trusting controller before the robot slides. Every step: μs under a moving foot varies.
      if (mode[i] === STANCE) {
        const wz = wanted[a + 2];
        if (wz < -this.coneTolerance_N || this.wantedTangential_N[i] - friction[i] * wz > this.coneTolerance_N) {
          this.commanded.step(i, h);
          anyCommanded = true;
        }
      }

      if (!(fz > threshold_N)) continue;

      // Friction margin m = 1 − |f_t|/(μs·f_n), floored (frictionMargin.ts), and its bin.
      const fx = force[a];
      const fy = force[a + 1];
      const tangential_N = Math.sqrt(fx * fx + fy * fy);
      const capacity_N = friction[i] * fz;
      const floor = this.floor;
      let margin = floor;
      if (capacity_N > 0) margin = 1 - tangential_N / capacity_N;
      else if (tangential_N === 0) margin = 1;
      if (margin < floor) margin = floor;
      const rawBin = Math.floor((margin - floor) / this.binWidth);
      this.margins[i] = margin;
      this.bins[i] = rawBin < 0 ? 0 : rawBin > this.lastBin ? this.lastBin : rawBin;

      // Slip of a loaded foot: distance ∫|v_t| dt, sliding when |v_t| exceeds the slip speed.
      const speed_mps = Math.sqrt(vx * vx + vy * vy);
      this.slipDistance_m[i] += speed_mps * h;
      if (speed_mps > this.slipSpeed_mps) {
        this.slip.step(i, h);
        anySlip = true;
      }

      // Touchdown or stance: a load after time in the air opens a touchdown (or, inside a
      // transient, times it again after a bounce); stance samples feed the stance margin, the
      // others the margin outside stance (the friction margin is both, merged at the end).
      if (td.airborne[i] === 1) {
        td.airborne[i] = 0;
        if (td.inTransient[i] === 0) td.open(i);
        td.transientStart_s[i] = time_s;
      }
      if (td.inTransient[i] === 1) {
        // Per touchdown: slip ∫|v_t| dt over its loaded transient steps, and its impact peak.
        const o = VALUES * i;
        td.current[o + SLIP] += speed_mps * h;
        if (fz > td.current[o + PEAK]) td.current[o + PEAK] = fz;
      }
      if (td.inTransient[i] === 0 && mode[i] === STANCE) this.stanceHistograms[i].addBinnedWeightedFrom(this.bins, this.margins, i, this.weight);
      else this.outsideStanceHistograms[i].addBinnedWeightedFrom(this.bins, this.margins, i, this.weight);
    }
    if (anyCommanded) this.commanded.step(n, h);
    if (anySlip) this.slip.step(n, h);
    this.fall.record(step);
  }

  /** The end of a control tick: interval edges are counted per tick (intervals.ts). */
  endTick(): void {
    this.commanded.endTick();
    this.slip.endTick();
    this.tickStarts = true;
  }
}
