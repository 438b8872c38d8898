// One (scenario × build) pair from start to result: open the build, run the episode, score it,
// close the build. Every failure becomes an `error` RunResult for this pair only.

import path from 'node:path';
import type { ControllerSetup } from '../builds/interface.js';
import { openBuild, type OpenBuildOptions, type OpenedBuild } from '../builds/loader.js';
import type { BuildSpec } from '../builds/spec.js';
import { gravityOnIncline } from '../plant/gravity.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { createSeriesRecorder } from '../score/series/recorder.js';
import { writeSeriesFile } from '../score/series/file.js';
import type { TickObserver } from '../score/sample.js';
import { describeError, runEpisode } from './episode.js';
import { createSteadyClock } from './steadyClock.js';
import { createErrorRunResult, createRunResult } from '../results/runResult.js';
import { createTraceWriter, tracePath, type TraceWriter } from '../results/trace.js';
import type { RunResult } from '../results/types.js';
import { attachObservations, observingBuild, type ObservationRequest } from './observed.js';

export interface RunTask {
  scenario: ResolvedScenario;
  build: BuildSpec;
  /** Results folder; traces go below it. */
  outDir: string;
  trace: boolean;
  /** Decimation of the trace (every n-th tick). */
  traceEveryNth?: number;
  buildOptions?: Pick<OpenBuildOptions, 'handshakeTimeout_ms' | 'tickTimeout_ms' | 'spin_us'>;
  /** Keep what the build observes in the run's first ticks (the gate's loop-time timing, observed.ts). */
  observe?: ObservationRequest;
}

function saveSeries(outDir: string, series: ReturnType<ReturnType<typeof createSeriesRecorder>['finish']>): void {
  try {
    writeSeriesFile(outDir, series);
  } catch {
    // A series file is for the report only; the run's result stands without it ("no series").
  }
}

export function controllerSetup(scenario: ResolvedScenario): ControllerSetup {
  const g = gravityOnIncline(new Float64Array(3), scenario.plant.ground.incline_deg.pitch, scenario.plant.ground.incline_deg.roll);
  return {
    robot: scenario.plant.robot,
    controlRate_Hz: scenario.control.rate_Hz,
    physicsStep_s: scenario.plant.physics.step_s,
    gravity_mps2: [g[0], g[1], g[2]],
    options: {},
  };
}

export async function runOne(task: RunTask, extraObservers: TickObserver[] = []): Promise<RunResult> {
  const { scenario, build: spec } = task;
  let build: OpenedBuild;
  try {
    // A module build gets a thread of its own: nothing it does reaches this thread's scorer.
    build = await openBuild(spec, controllerSetup(scenario), { isolation: 'thread', ...task.buildOptions });
  } catch (caught) {
    return createErrorRunResult(scenario, spec.name, { ...describeError(caught, 0), time_s: 0 });
  }

  let trace: TraceWriter | undefined;
  let traceRelative: string | undefined;
  // Plot series for the report, for every run (traces are optional, the report is not).
  const recorder = createSeriesRecorder(scenario, spec.name);
  const steady = createSteadyClock(scenario.duration_s);
  const observers: TickObserver[] = [...extraObservers, recorder, steady];
  const observing = task.observe ? observingBuild(build, task.observe, scenario.plant.robot.hips_m.length) : undefined;
  try {
    const outcome = await runEpisode(scenario, observing?.build ?? build, {
      observers,
      onScorer(scorer) {
        if (!task.trace) return;
        traceRelative = tracePath(scenario.id, spec.name);
        trace = createTraceWriter(path.join(task.outDir, traceRelative), scenario.plant.robot.hips_m.length, scorer.loadedThreshold_N, {
          everyNth: task.traceEveryNth ?? 1,
          telemetryNames: build.telemetryNames,
        });
        const writer = trace;
        observers.push({ onTick: (sample, action) => writer.writeRow(sample, action.telemetry) });
      },
    });
    trace?.close();
    const series = recorder.finish();
    saveSeries(task.outDir, series);
    const options = { ...(traceRelative ? { trace: traceRelative } : {}), telemetry: recorder.telemetryRanges() };
    const result = outcome.error
      ? createErrorRunResult(scenario, spec.name, outcome.error, outcome.scored, options)
      : createRunResult(scenario, spec.name, outcome.scored, options);
    // Beside the scorer's whole-run (cold) figure, the later half's (steady) one.
    if (result.sim) result.sim = { ...result.sim, steadyRealTimeFactor: steady.realTimeFactor() };
    // Only from a run without an error: the gate records again when a run failed (as it did before).
    if (observing && !outcome.error) attachObservations(result, observing.observations());
    return result;
  } catch (caught) {
    trace?.abort();
    return createErrorRunResult(scenario, spec.name, describeError(caught, 0));
  } finally {
    await build.close().catch(() => undefined);
  }
}
