// The bench's measurements, one function per figure: the plant alone; per build the governor
// update and the controller tick on observations recorded from the build's own run of the
// scenario; the closed loop (plant + build + sensing + scorer, i.e. what `footing run` does per
// tick, without trace or plot recording); and for process builds the protocol overhead.

import type { ObservationRequest } from '../run/observed.js';
import { createAction, STANCE, type Action } from '../contract/tick.js';
import { openBuild, type OpenBuildOptions, type OpenedBuild } from '../builds/loader.js';
import type { BuildSpec } from '../builds/spec.js';
import { Plant } from '../plant/plant.js';
import { runEpisode } from '../run/episode.js';
import { controllerSetup } from '../run/runOne.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { measureTask, rateFigure, type TaskBudget } from './batch.js';
import { ObservationRing, recordingBuild } from './recording.js';
import type { BuildBench, ClosedLoopFigure, PlantBench, ProtocolOverhead } from './types.js';

/** Largest recording kept per build; longer runs are decimated evenly so the ring spans the run. */
export const MAX_RECORDED_OBSERVATIONS = 4000;

/** Calls per tinybench sample (batch.ts): about a millisecond of work each on this machine class. */
const PLANT_BATCH = 2000;
const GOVERNOR_BATCH = 1000;
const IN_PROCESS_TICK_BATCH = 200;
const PROCESS_TICK_BATCH = 20;

export function ticksOf(scenario: ResolvedScenario): { substeps: number; tickCount: number } {
  // Same arithmetic as the episode loop (harness/run/episode.ts).
  const step_s = scenario.plant.physics.step_s;
  const substeps = Math.max(1, Math.round(1 / scenario.control.rate_Hz / step_s));
  return { substeps, tickCount: Math.round(scenario.duration_s / (substeps * step_s)) };
}

/**
 * The plant alone, all feet in contact: the trunk's weight shared evenly by the four stance legs
 * (each wants a ground force of a quarter of the trunk's weight against gravity), so it stands
 * still and every step does the full contact work (normal law and friction solve per foot).
 */
export async function benchPlant(scenario: ResolvedScenario, budget: TaskBudget): Promise<PlantBench> {
  const plant = new Plant(scenario.plant);
  const n = plant.footCount;
  const action = createAction(n, 0);
  const g = plant.gravity_mps2;
  const share_kg = scenario.plant.robot.trunk.mass_kg / n;
  for (let i = 0; i < n; i++) {
    action.mode[i] = STANCE;
    for (let a = 0; a < 3; a++) action.groundForce_N[3 * i + a] = -share_kg * g[a];
  }
  plant.applyAction(action);
  const stats = await measureTask('plant.step', () => {
    for (let k = 0; k < PLANT_BATCH; k++) plant.step();
  }, PLANT_BATCH, budget);
  let allInContact = true;
  for (let i = 0; i < n; i++) if (plant.footInContact[i] === 0) allInContact = false;
  const physicsRate_Hz = 1 / plant.step_s;
  const steps = rateFigure(stats, scenario.control.rate_Hz);
  return {
    robot: scenario.plant.robot.id,
    footCount: n,
    step_s: plant.step_s,
    allFeetInContact: allInContact,
    steps,
    stepsPerSecond: steps.perSecond,
    realTimeFactor: steps.perSecond / physicsRate_Hz,
  };
}

/** Runs the scenario once with the build, recording its observations. */
/** Which ticks a recording of `scenario` keeps (the same plan for a suite run asked to observe). */
export function recordingPlan(scenario: ResolvedScenario): ObservationRequest {
  const { tickCount } = ticksOf(scenario);
  const capacity = Math.max(1, Math.min(tickCount, MAX_RECORDED_OBSERVATIONS));
  return { tickCount, capacity, everyNth: Math.max(1, Math.ceil(tickCount / capacity)) };
}

export async function recordObservations(scenario: ResolvedScenario, spec: BuildSpec, openOptions: OpenBuildOptions): Promise<ObservationRing> {
  const { capacity, everyNth } = recordingPlan(scenario);
  const footCount = scenario.plant.robot.hips_m.length;
  const ring = new ObservationRing(capacity, footCount);
  const build = await openBuild(spec, controllerSetup(scenario), openOptions);
  try {
    const outcome = await runEpisode(scenario, recordingBuild(build, ring, everyNth));
    if (outcome.error) throw new Error(`recording run failed at t = ${outcome.error.time_s} s: ${outcome.error.message}`);
  } finally {
    await build.close();
  }
  if (ring.size === 0) throw new Error('the recording run produced no observation');
  return ring;
}

/**
 * Ticks on the recorded observations (through the opened build, so the timing wrapper and the
 * finite check the episode loop pays are included). For process builds also the protocol
 * overhead: each tick's round trip minus the compute time the build reported for it.
 */
async function benchTicks(
  build: OpenedBuild,
  ring: ObservationRing,
  action: Action,
  controlRate_Hz: number,
  budget: TaskBudget,
): Promise<{ tick: BuildBench['tick']; protocolOverhead?: ProtocolOverhead }> {
  if (build.kind !== 'process') {
    const stats = await measureTask(`${build.name}.tick`, () => {
      for (let k = 0; k < IN_PROCESS_TICK_BATCH; k++) build.tick(ring.next(), action);
    }, IN_PROCESS_TICK_BATCH, budget);
    return { tick: rateFigure(stats, controlRate_Hz) };
  }
  const overhead = new Float64Array(1 << 16);
  const compute = new Float64Array(1 << 16);
  let count = 0;
  const stats = await measureTask(`${build.name}.tick`, async () => {
    for (let k = 0; k < PROCESS_TICK_BATCH; k++) {
      await build.tick(ring.next(), action);
      const slot = count++ & (overhead.length - 1);
      overhead[slot] = build.loopTime_us - build.reportedCompute_us;
      compute[slot] = build.reportedCompute_us;
    }
  }, PROCESS_TICK_BATCH, budget, { async: true });
  return { tick: rateFigure(stats, controlRate_Hz), protocolOverhead: summariseOverhead(overhead, compute, Math.min(count, overhead.length)) };
}

function summariseOverhead(overhead: Float64Array, compute: Float64Array, count: number): ProtocolOverhead {
  const values = Array.from(overhead.subarray(0, count)).filter(Number.isFinite).sort((a, b) => a - b);
  const computed = Array.from(compute.subarray(0, count)).filter(Number.isFinite);
  const mean = (list: number[]) => (list.length === 0 ? Number.NaN : list.reduce((s, x) => s + x, 0) / list.length);
  const quantile = (q: number) => (values.length === 0 ? Number.NaN : values[Math.min(values.length - 1, Math.floor(q * values.length))]);
  return { mean_us: mean(values), p50_us: quantile(0.5), p99_us: quantile(0.99), reportedCompute_mean_us: mean(computed), samples: values.length };
}

/**
 * One governor update per call on the recorded observations. The build first replays the whole
 * recording through tick(), so the constraint table the updates run on is the one linearised at
 * the run's last tick (the final stand: every foot in stance, the largest table).
 */
async function benchGovernor(build: OpenedBuild, ring: ObservationRing, action: Action, controlRate_Hz: number, budget: TaskBudget) {
  const update = build.governorUpdate;
  if (typeof update !== 'function') return undefined;
  for (let k = 0; k < ring.size; k++) await build.tick(ring.next(), action);
  const stats = await measureTask(`${build.name}.governorUpdate`, () => {
    for (let k = 0; k < GOVERNOR_BATCH; k++) update(ring.next());
  }, GOVERNOR_BATCH, budget);
  const figure = rateFigure(stats, controlRate_Hz);
  return { ...figure, updatesPerSecond: figure.perSecond };
}

/** Whole episodes with a freshly opened build each; only the episode is timed (overriddenDuration). */
async function benchClosedLoop(scenario: ResolvedScenario, spec: BuildSpec, openOptions: OpenBuildOptions, budget: TaskBudget): Promise<ClosedLoopFigure> {
  let simulated_s = scenario.duration_s;
  let endedEarly: string | undefined;
  const setup = controllerSetup(scenario);
  const stats = await measureTask(`${spec.name}.closedLoop`, async () => {
    const build = await openBuild(spec, setup, openOptions);
    try {
      const start = performance.now();
      const outcome = await runEpisode(scenario, build);
      const elapsed_ms = performance.now() - start;
      simulated_s = outcome.scored.sim.duration_s;
      if (outcome.error) endedEarly = outcome.error.message;
      return { overriddenDuration: elapsed_ms };
    } finally {
      await build.close();
    }
  }, 1, { time_ms: budget.time_ms, iterations: Math.min(budget.iterations, 3) }, { async: true });
  return { ...stats, simulated_s, realTimeFactor: simulated_s / (stats.mean_us / 1e6), ...(endedEarly ? { endedEarly } : {}) };
}

/**
 * A build's steady closed loop: whole episodes with a freshly opened build each, the median
 * episode after tinybench's warm-up (the first episodes of a process run while the JIT compiles:
 * 5× and 2.5× the steady time measured). The bench runs it in threads of its own (ownThread.ts).
 */
export async function steadyClosedLoop(scenario: ResolvedScenario, spec: BuildSpec, budget: TaskBudget): Promise<SteadyClosedLoop> {
  let simulated_s = scenario.duration_s;
  const setup = controllerSetup(scenario);
  const stats = await measureTask(`${spec.name}.steadyClosedLoop`, async () => {
    const build = await openBuild(spec, setup, {});
    try {
      const start = performance.now();
      const outcome = await runEpisode(scenario, build);
      const elapsed_ms = performance.now() - start;
      simulated_s = outcome.scored.sim.duration_s;
      return { overriddenDuration: elapsed_ms };
    } finally {
      await build.close();
    }
  }, 1, { time_ms: budget.time_ms, iterations: Math.max(8, Math.min(budget.iterations, 16)) }, { async: true });
  return { episode_ms: stats.p50_us / 1000, simulated_s, realTimeFactor: simulated_s / (stats.p50_us / 1e6) };
}

export interface SteadyClosedLoop {
  /** Median episode wall time after the warm-up. */
  episode_ms: number;
  simulated_s: number;
  realTimeFactor: number;
}

export async function benchBuild(scenario: ResolvedScenario, spec: BuildSpec, budget: TaskBudget, openOptions: OpenBuildOptions = {}): Promise<BuildBench> {
  const controlRate_Hz = scenario.control.rate_Hz;
  const ring = await recordObservations(scenario, spec, openOptions);
  const build = await openBuild(spec, controllerSetup(scenario), openOptions);
  let ticks: Awaited<ReturnType<typeof benchTicks>>;
  let governor: BuildBench['governor'];
  try {
    const action = createAction(scenario.plant.robot.hips_m.length, build.telemetryNames.length);
    ticks = await benchTicks(build, ring, action, controlRate_Hz, budget);
    governor = await benchGovernor(build, ring, action, controlRate_Hz, budget);
  } finally {
    await build.close();
  }
  const closedLoop = await benchClosedLoop(scenario, spec, openOptions, budget);
  return {
    name: spec.name,
    spec: spec.text,
    kind: spec.kind,
    ...(governor ? { governor } : {}),
    tick: ticks.tick,
    ticksPerSecond: ticks.tick.perSecond,
    closedLoop,
    realTimeFactor: closedLoop.realTimeFactor,
    ...(ticks.protocolOverhead ? { protocolOverhead: ticks.protocolOverhead } : {}),
    recordedObservations: ring.size,
  };
}
