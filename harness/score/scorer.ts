// The streaming scorer of one run. The episode loop feeds recordStep() after every physics step
// (margin, stance and touchdowns, slip, commanded violations and falls see every step, so no
// metric depends on where control ticks fall) and record() once per control tick (tick counts,
// interval edges from each tick's worst case, tracking, loop time). A caller feeding ticks only
// (hand-made traces) gets each tick scored as one step of the control period. Nothing allocates:
// every tracker preallocates its state. finish() returns the run's metrics.
// Definitions and thresholds: docs/scoring.md.

import type { ResolvedScenario } from '../scenario/types.js';
import { LoopTimeTracker } from './loopTime.js';
import type { HeldAction, StepView, TickSample } from './sample.js';
import { StepPass } from './stepPass.js';
import { DEFAULT_LOADED_FRACTION, DEFAULT_SLIP_SPEED_mps, loadedThreshold_N, totalMass_kg, TOUCHDOWN_TRANSIENT_s } from './thresholds.js';
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
  return new RunScorer(scenario, options);
}

/**
 * A class, not an object of closures: its methods are the same functions in every run, so the
 * episode loop's optimised code inlines them once for all runs (closures made per run were new
 * call targets each run and deoptimised it, docs/bench.md).
 */
class RunScorer implements Scorer {
  readonly loadedThreshold_N: number;
  private readonly scenario: ResolvedScenario;
  private readonly footCount: number;
  private readonly slipSpeed_mps: number;
  private readonly pass: StepPass;
  private readonly tracking: TrackingTracker;
  private readonly loop: LoopTimeTracker;
  private readonly tickAsStep = new TickAsStep();
  private ticks = 0;
  private steps = 0;
  private stepsThisTick = 0;
  /** In an array: a double field written every tick stays unboxed there. */
  private readonly lastTime_s = new Float64Array(1);

  constructor(scenario: ResolvedScenario, options: ScorerOptions) {
    const robot = scenario.plant.robot;
    const loadedFraction = options.loadedFraction ?? DEFAULT_LOADED_FRACTION;
    const slipSpeed_mps = options.slipSpeed_mps ?? DEFAULT_SLIP_SPEED_mps;
    if (!(loadedFraction >= 0)) throw new RangeError(`scorer: loadedFraction ${loadedFraction} must be ≥ 0`);
    if (!(slipSpeed_mps >= 0)) throw new RangeError(`scorer: slipSpeed_mps ${slipSpeed_mps} must be ≥ 0`);
    this.scenario = scenario;
    this.footCount = robot.hips_m.length;
    this.slipSpeed_mps = slipSpeed_mps;
    this.loadedThreshold_N = loadedThreshold_N(robot, loadedFraction);
    this.pass = new StepPass({
      footCount: this.footCount,
      loadedThreshold_N: this.loadedThreshold_N,
      slipSpeed_mps,
      touchdownTransient_s: options.touchdownTransient_s ?? TOUCHDOWN_TRANSIENT_s,
      duration_s: scenario.duration_s,
      settledStart: scenario.plant.initial.start === 'settled',
      standingHeight_m: robot.standingHeight_m,
    });
    this.tracking = new TrackingTracker(commandedTravel_m(scenario.commands, scenario.duration_s));
    this.loop = new LoopTimeTracker(scenario.control.loopBudget_us);
  }

  recordStep(step: StepView, held: HeldAction): void {
    this.steps++;
    this.stepsThisTick++;
    this.pass.recordStep(step, held);
  }

  record(sample: TickSample): void {
    if (this.stepsThisTick === 0) this.recordStep(this.tickAsStep.view(sample), sample);
    this.stepsThisTick = 0;
    this.ticks++;
    this.lastTime_s[0] = sample.time_s;
    this.pass.endTick();
    this.tracking.record(sample);
    this.loop.record(sample.loopTime_us);
  }

  get fallen(): boolean {
    return this.pass.fall.fallen;
  }

  get fellAt_s(): number | null {
    return this.pass.fall.fellAt_s;
  }

  get fallReason(): FallReason | null {
    return this.pass.fall.reason;
  }

  finish(sim: SimInfo): RunMetrics {
    const { scenario, footCount, pass, tracking } = this;
    const robot = scenario.plant.robot;
    const duration_s = sim.duration_s ?? this.lastTime_s[0];
    const { commanded, slip, fall } = pass;
    const perFoot: ViolationCounts[] = [];
    for (let i = 0; i < footCount; i++) {
      perFoot.push({
        commanded: commanded.count[i],
        commandedTime_s: commanded.time_s[i],
        slip: slip.count[i],
        slipTime_s: slip.time_s[i],
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
        ticks: this.ticks,
        loadedThreshold_N: this.loadedThreshold_N,
        steps: this.steps,
        slipSpeed_mps: this.slipSpeed_mps,
        frictionMargin: pass.margin.result(pass.touchdown.stance),
        stanceMargin: pass.touchdown.stanceMargin(),
        touchdown: pass.touchdown.result(),
        violations: {
          commanded: commanded.count[footCount],
          commandedTime_s: commanded.time_s[footCount],
          slip: slip.count[footCount],
          slipTime_s: slip.time_s[footCount],
          perFoot,
        },
        slipDistance_m: totalOf(pass.slipDistance_m),
        slipDistancePerFoot_m: Array.from(pass.slipDistance_m),
        fell: fall.fallen,
        fellAt_s: fall.fellAt_s,
        fallReason: fall.reason,
        trackingRms_m: tracking.rms_m(),
        commandedTravel_m: tracking.commandedLength_m,
        progress: tracking.progress(),
        loopTime_us: this.loop.result(),
      },
    };
  }
}

/** Σ in foot order. */
function totalOf(values: Float64Array): number {
  let total = 0;
  for (let i = 0; i < values.length; i++) total += values[i];
  return total;
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
