// One run: a resolved scenario replayed through one opened build. Per control tick: the plant's
// truth becomes an observation (with the scenario's sensing), the build answers with an action,
// the plant holds it for the tick's physics steps, the scorer sees every physics step (the plant
// itself is the step view: nothing is copied) and then the tick — the tick sample reads the
// plant's arrays in place too —, as do optional trace/recorders. A build failure or a diverged
// plant ends the run as an `error`, never the suite.
// OpenedBuild (builds/loader.ts) already times each tick and refuses non-finite actions.

import { createAction, createObservation, type Action } from '../contract/tick.js';
import type { OpenedBuild } from '../builds/loader.js';
import { BuildFailure } from '../builds/process/failure.js';
import { PlantDivergedError } from '../plant/errors.js';
import { Plant } from '../plant/plant.js';
import type { SubstepObserver } from '../plant/types.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createTickSample, type EpisodeStart, type TickObserver, type TickSample } from '../score/sample.js';
import { createScorer, type RunMetrics, type Scorer } from '../score/scorer.js';
import type { RunError } from '../results/types.js';
import { CommandSchedule } from './commands.js';
import { SensorModel } from './sensing.js';

export interface EpisodeOptions {
  observers?: TickObserver[];
  /** Called with the scorer before the first tick (a trace writer needs its loaded threshold). */
  onScorer?(scorer: Scorer): void;
}

export interface EpisodeOutcome {
  scored: RunMetrics;
  /** Present when the run broke off. */
  error?: RunError;
}

export async function runEpisode(scenario: ResolvedScenario, build: OpenedBuild, options: EpisodeOptions = {}): Promise<EpisodeOutcome> {
  const plant = new Plant(scenario.plant);
  const n = plant.footCount;
  const controlPeriod_s = 1 / scenario.control.rate_Hz;
  const substeps = Math.max(1, Math.round(controlPeriod_s / plant.step_s));
  const tickCount = Math.round(scenario.duration_s / (substeps * plant.step_s));
  const dt_s = substeps * plant.step_s;

  const obs = createObservation(n);
  const action = createAction(n, build.telemetryNames.length);
  const sample = createTickSample(n);
  sample.dt_s = dt_s;
  viewPlantState(sample, plant);
  const sensors = new SensorModel(scenario.sensing, scenario.seed);
  const initialYaw_rad = (scenario.plant.initial.rpy_deg[2] * Math.PI) / 180;
  const commands = new CommandSchedule(scenario.commands, initialYaw_rad, dt_s);
  const scorer = createScorer(scenario);
  options.onScorer?.(scorer);
  const observers = options.observers ?? [];
  const start: EpisodeStart = { footCount: n, telemetryNames: build.telemetryNames, loadedThreshold_N: scorer.loadedThreshold_N };
  for (const observer of observers) observer.onStart?.(start);
  sample.referencePosition_m[0] = scenario.plant.initial.position_m[0];
  sample.referencePosition_m[1] = scenario.plant.initial.position_m[1];
  sample.referencePosition_m[2] = scenario.plant.robot.standingHeight_m;

  const scoreSteps = new StepScoring(scorer, plant, sample);

  const wallStart = performance.now();
  let error: RunError | undefined;
  try {
    for (let tick = 0; tick < tickCount; tick++) {
      plant.fillObservation(obs);
      sensors.apply(obs, plant.footStaticFriction);
      commands.advance(obs, sample.referencePosition_m); // obs.time_s is the plant's time

      const pending = build.tick(obs, action);
      if (pending !== undefined) await pending; // process builds; in-process ticks stay synchronous

      plant.applyAction(action);
      holdAction(sample, action);
      // Every physics step is scored, not only the tick's last, and every landing substep.
      for (let s = 0; s < substeps; s++) plant.step(scoreSteps);

      sample.time_s = plant.time_s;
      sample.trunkGroundForce_N = plant.trunkGroundForce_N;
      sample.loopTime_us = build.loopTime_us;
      sample.reportedCompute_us = build.reportedCompute_us;
      scorer.record(sample);
      for (let k = 0; k < observers.length; k++) observers[k].onTick(sample, action);
      if (scorer.fallen) break; // a fallen robot is scored as fallen; the rest would be noise
    }
  } catch (caught) {
    error = describeError(caught, plant.time_s);
  }
  const wall_s = (performance.now() - wallStart) / 1000;
  return { scored: scorer.finish({ wall_s, duration_s: plant.time_s }), ...(error ? { error } : {}) };
}

/**
 * Feeds every physics step to the scorer. A class, not a closure made per run: the plant's step
 * then sees one call target in every run, so its optimised code stays valid from run to run.
 */
class StepScoring implements SubstepObserver {
  constructor(
    private readonly scorer: Scorer,
    private readonly plant: Plant,
    private readonly sample: TickSample,
  ) {}

  afterSubstep(): void {
    this.scorer.recordStep(this.plant, this.sample);
  }
}

/**
 * The action the plant holds over the tick's steps, as the sample carries it to the scorer. Copied
 * (a build may swap its action's arrays), element by element: for a dozen values a plain loop is
 * several times cheaper than TypedArray.set (measured, docs/bench.md).
 */
function holdAction(sample: TickSample, action: Action): void {
  const mode = sample.mode;
  const wanted = sample.wantedForce_N;
  const fromMode = action.mode;
  const fromWanted = action.groundForce_N;
  for (let i = 0; i < mode.length; i++) mode[i] = fromMode[i];
  for (let j = 0; j < wanted.length; j++) wanted[j] = fromWanted[j];
}

/**
 * Points the sample's state arrays at the plant's own (once per run): the sample is read after the
 * tick's steps and before the next tick's, so it sees exactly what a per-tick copy would hold, and
 * no observer may keep it (TickObserver). Only the scalars are set per tick.
 */
function viewPlantState(sample: TickSample, plant: Plant): void {
  sample.trunkPosition_m = plant.trunkPosition_m;
  sample.trunkQuaternion = plant.trunkQuaternion;
  sample.trunkVelocity_mps = plant.trunkVelocity_mps;
  sample.trunkAngularVelocity_radps = plant.trunkAngularVelocity_radps;
  sample.footPosition_m = plant.footPosition_m;
  sample.footVelocity_mps = plant.footVelocity_mps;
  sample.footForce_N = plant.footGroundForce_N;
  sample.footContact = plant.footInContact;
  sample.footStaticFriction = plant.footStaticFriction;
}

export function describeError(caught: unknown, time_s: number): RunError {
  if (caught instanceof BuildFailure) {
    return { message: caught.message, time_s, reason: caught.reason, ...(caught.stderrTail ? { stderrTail: caught.stderrTail } : {}) };
  }
  if (caught instanceof PlantDivergedError) {
    return { message: caught.message, time_s: caught.time_s, reason: 'diverged' };
  }
  const message = caught instanceof Error ? caught.message : String(caught);
  return { message, time_s, reason: 'internal' };
}
