// The streaming scorer of one run. The episode loop feeds recordStep() after every physics step
// (margin, stance and touchdowns, slip, commanded violations and falls see every step, so no
// metric depends on where control ticks fall) and record() once per control tick (tick counts,
// interval edges from each tick's worst case, tracking, loop time). A caller feeding ticks only
// (hand-made traces) gets each tick scored as one step of the control period. Nothing allocates:
// every tracker preallocates its state. finish() returns the run's metrics.
// Definitions and thresholds: docs/scoring.md.

import type { ResolvedScenario } from '../scenario/types.js';
import { CommandedViolationTracker } from './commanded.js';
import { FallDetector } from './fall.js';
import { FrictionMarginTracker } from './frictionMargin.js';
import { LoopTimeTracker } from './loopTime.js';
import type { HeldAction, StepView, TickSample } from './sample.js';
import { SlipTracker } from './slip.js';
import { DEFAULT_LOADED_FRACTION, DEFAULT_SLIP_SPEED_mps, loadedThreshold_N, totalMass_kg, TOUCHDOWN_TRANSIENT_s } from './thresholds.js';
import { TouchdownTracker } from './touchdown.js';
import { commandedTravel_m, TrackingTracker } from './tracking.js';
import type { FallReason, RunMetrics, SimInfo, ViolationCounts } from './types.js';

export type * from './types.js';

export interface ScorerOptions {
  /** Loaded when f_n > loadedFraction × total mass × |g| (default DEFAULT_LOADED_FRACTION). */
  loadedFraction?: number;
  /** Slipping when a loaded foot's tangential speed exceeds this (default DEFAULT_SLIP_SPEED_mps). */
  slipSpeed_mps?: number;
  /** Length of a touchdown's transient (default TOUCHDOWN_TRANSIENT_s). */
  touchdownTransient_s?: number;
}

export interface Scorer {
  /** One physics step: the plant's state after it, and the action held over the tick. */
  recordStep(step: StepView, held: HeldAction): void;
  /** The end of a control tick (after its recordStep calls, or alone: then it is the tick's one step). */
  record(sample: TickSample): void;
  readonly fallen: boolean;
  readonly fellAt_s: number | null;
  readonly fallReason: FallReason | null;
  /** The loaded threshold in use (the trace writer's `loaded` column uses the same). */
  readonly loadedThreshold_N: number;
  finish(sim: SimInfo): RunMetrics;
}

export function createScorer(scenario: ResolvedScenario, options: ScorerOptions = {}): Scorer {
  const robot = scenario.plant.robot;
  const footCount = robot.hips_m.length;
  const loadedFraction = options.loadedFraction ?? DEFAULT_LOADED_FRACTION;
  const slipSpeed_mps = options.slipSpeed_mps ?? DEFAULT_SLIP_SPEED_mps;
  if (!(loadedFraction >= 0)) throw new RangeError(`scorer: loadedFraction ${loadedFraction} must be ≥ 0`);
  if (!(slipSpeed_mps >= 0)) throw new RangeError(`scorer: slipSpeed_mps ${slipSpeed_mps} must be ≥ 0`);
  const threshold_N = loadedThreshold_N(robot, loadedFraction);

  const margin = new FrictionMarginTracker(footCount, threshold_N);
  const commanded = new CommandedViolationTracker(footCount);
  const slip = new SlipTracker(footCount, threshold_N, slipSpeed_mps);
  const fall = new FallDetector(robot.standingHeight_m);
  const transient_s = options.touchdownTransient_s ?? TOUCHDOWN_TRANSIENT_s;
  const touchdown = new TouchdownTracker(footCount, threshold_N, transient_s, scenario.duration_s, scenario.plant.initial.start === 'settled');
  const tracking = new TrackingTracker(commandedTravel_m(scenario.commands, scenario.duration_s));
  const loop = new LoopTimeTracker(scenario.control.loopBudget_us);
  const tickAsStep = new TickAsStep();
  let ticks = 0;
  let steps = 0;
  let stepsThisTick = 0;
  let lastTime_s = 0;

  const recordStep = (step: StepView, held: HeldAction): void => {
    steps++;
    stepsThisTick++;
    margin.recordStep(step);
    touchdown.recordStep(step, held, margin.margins, margin.marginBins, margin.weight);
    commanded.recordStep(step, held);
    slip.recordStep(step);
    fall.record(step);
  };

  return {
    recordStep,
    record(sample: TickSample): void {
      if (stepsThisTick === 0) recordStep(tickAsStep.view(sample), sample);
      stepsThisTick = 0;
      ticks++;
      lastTime_s = sample.time_s;
      commanded.endTick();
      slip.endTick();
      tracking.record(sample);
      loop.record(sample.loopTime_us);
    },
    get fallen() {
      return fall.fallen;
    },
    get fellAt_s() {
      return fall.fellAt_s;
    },
    get fallReason() {
      return fall.reason;
    },
    loadedThreshold_N: threshold_N,
    finish(sim: SimInfo): RunMetrics {
      const duration_s = sim.duration_s ?? lastTime_s;
      const perFoot: ViolationCounts[] = [];
      for (let i = 0; i < footCount; i++) {
        perFoot.push({
          commanded: commanded.perFoot[i].count,
          commandedTime_s: commanded.perFoot[i].time_s,
          slip: slip.perFoot[i].count,
          slipTime_s: slip.perFoot[i].time_s,
        });
      }
      return {
        sim: {
          duration_s,
          wall_s: sim.wall_s,
          realTimeFactor: sim.wall_s > 0 ? duration_s / sim.wall_s : null,
          physicsStep_s: scenario.plant.physics.step_s,
          controlRate_Hz: scenario.control.rate_Hz,
          totalMass_kg: totalMass_kg(robot),
        },
        metrics: {
          ticks,
          loadedThreshold_N: threshold_N,
          steps,
          slipSpeed_mps,
          frictionMargin: margin.result(),
          stanceMargin: touchdown.stanceMargin(),
          touchdown: touchdown.result(),
          violations: {
            commanded: commanded.union.count,
            commandedTime_s: commanded.union.time_s,
            slip: slip.union.count,
            slipTime_s: slip.union.time_s,
            perFoot,
          },
          slipDistance_m: slip.totalDistance_m(),
          slipDistancePerFoot_m: Array.from(slip.distancePerFoot_m),
          fell: fall.fallen,
          fellAt_s: fall.fellAt_s,
          fallReason: fall.reason,
          trackingRms_m: tracking.rms_m(),
          commandedTravel_m: tracking.commandedLength_m,
          progress: tracking.progress(),
          loopTime_us: loop.result(),
        },
      };
    },
  };
}

/** A tick sample seen as one physics step of the control period (preallocated, fields re-pointed). */
class TickAsStep implements StepView {
  time_s = 0;
  step_s = 0;
  lastStep_s = 0;
  stepWeight = 1;
  trunkGroundForce_N = 0;
  trunkPosition_m: Float64Array = new Float64Array(3);
  trunkQuaternion: Float64Array = new Float64Array(4);
  footVelocity_mps: Float64Array = new Float64Array(0);
  footGroundForce_N: Float64Array = new Float64Array(0);
  footStaticFriction: Float64Array = new Float64Array(0);

  view(sample: TickSample): StepView {
    this.time_s = sample.time_s;
    this.step_s = sample.dt_s;
    this.lastStep_s = sample.dt_s;
    this.trunkGroundForce_N = sample.trunkGroundForce_N;
    this.trunkPosition_m = sample.trunkPosition_m;
    this.trunkQuaternion = sample.trunkQuaternion;
    this.footVelocity_mps = sample.footVelocity_mps;
    this.footGroundForce_N = sample.footForce_N;
    this.footStaticFriction = sample.footStaticFriction;
    return this;
  }
}
