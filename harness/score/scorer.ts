// The streaming scorer of one run: record() is fed every control tick by the episode loop (it
// allocates nothing: every tracker preallocates its state), finish() returns the run's metrics.
// Definitions and thresholds: docs/scoring.md.

import type { ResolvedScenario } from '../scenario/types.js';
import { CommandedViolationTracker } from './commanded.js';
import { FallDetector } from './fall.js';
import { FrictionMarginTracker } from './frictionMargin.js';
import { LoopTimeTracker } from './loopTime.js';
import type { TickSample } from './sample.js';
import { SlipTracker } from './slip.js';
import { DEFAULT_LOADED_FRACTION, DEFAULT_SLIP_SPEED_mps, loadedThreshold_N, totalMass_kg } from './thresholds.js';
import { commandedTravel_m, TrackingTracker } from './tracking.js';
import type { FallReason, RunMetrics, SimInfo, ViolationCounts } from './types.js';

export type * from './types.js';

export interface ScorerOptions {
  /** Loaded when f_n > loadedFraction × total mass × |g| (default DEFAULT_LOADED_FRACTION). */
  loadedFraction?: number;
  /** Slipping when a loaded foot's tangential speed exceeds this (default DEFAULT_SLIP_SPEED_mps). */
  slipSpeed_mps?: number;
}

export interface Scorer {
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
  const tracking = new TrackingTracker(commandedTravel_m(scenario.commands, scenario.duration_s));
  const loop = new LoopTimeTracker(scenario.control.loopBudget_us);
  let ticks = 0;
  let lastTime_s = 0;

  return {
    record(sample: TickSample): void {
      ticks++;
      lastTime_s = sample.time_s;
      margin.record(sample);
      commanded.record(sample);
      slip.record(sample);
      fall.record(sample);
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
          slipSpeed_mps,
          frictionMargin: margin.result(),
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
