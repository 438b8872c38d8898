// The gate's loop-time measurement for a suite run (docs/scoring.md): the baseline's observations
// (kept by its own suite runs, else recorded here), then each candidate timed against the baseline
// on them in interleaved rounds (pairedLoopTime.ts). A build that cannot be opened (it failed to
// build) is left out by the caller: its runs are error runs already.
//
// `footing run` measures it in a thread of its own (loopTimeThread.ts) while its own thread reads
// the series and draws the report's plots, which do not depend on it: the rounds alternate the two
// builds, so the other thread's load reaches both sides alike (pairedTiming.ts). Builds that start
// programs are timed here in the calling thread, where the process-group bookkeeping of run/ lives.

import { Worker } from 'node:worker_threads';
import type { BuildSpec } from '../builds/spec.js';
import type { PackedObservations } from '../contract/packed.js';
import type { PairedLoopTimeRecord } from '../results/loopTime.js';
import { postedScenario, receivedScenario, type PostedScenario } from '../run/sharedRaster.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { measurePairedLoopTime, recordStreams, timedScenarios } from './pairedLoopTime.js';

export interface SuiteLoopTimeInput {
  /** The suite's scenarios (the timed ones are chosen from them). */
  scenarios: readonly ResolvedScenario[];
  baseline: BuildSpec;
  candidates: readonly BuildSpec[];
  /** What the baseline's own suite runs kept, by scenario id (moved to the thread when measured in one). */
  observed: ReadonlyMap<string, PackedObservations>;
}

/** The measurement in this thread; every problem becomes a log line and a missing record. */
export async function measureSuiteLoopTimes(input: SuiteLoopTimeInput, log: (line: string) => void): Promise<PairedLoopTimeRecord[]> {
  const { baseline, candidates } = input;
  if (candidates.length === 0) return [];
  const records: PairedLoopTimeRecord[] = [];
  try {
    const recordings = await recordStreams(input.scenarios, baseline, {}, input.observed);
    log(`loop time: ${candidates.length} build${candidates.length === 1 ? '' : 's'} timed against ${baseline.name} in interleaved rounds on ${recordings.length} recorded scenario${recordings.length === 1 ? '' : 's'}`);
    for (const candidate of candidates) {
      try {
        const timing = await measurePairedLoopTime(recordings, baseline, candidate);
        records.push({ baselineBuild: baseline.name, candidateBuild: candidate.name, ...timing });
      } catch (error) {
        log(`loop time: ${candidate.name} not timed (${(error as Error).message})`);
      }
    }
  } catch (error) {
    log(`loop time: not judged, the baseline's observations could not be recorded (${(error as Error).message})`);
  }
  return records;
}

/** Whether the measurement may leave this thread: every build runs in-process (no program of its own). */
export function timeableInThread(input: SuiteLoopTimeInput): boolean {
  return [input.baseline, ...input.candidates].every((spec) => spec.kind !== 'process');
}

/** What crosses to the thread: only the timed scenarios (rasters in shared memory), their kept observations. */
export interface LoopTimeThreadInput {
  scenarios: PostedScenario[];
  baseline: BuildSpec;
  candidates: BuildSpec[];
  observed: [string, PackedObservations][];
}

export type LoopTimeThreadMessage = { kind: 'log'; line: string } | { kind: 'records'; records: PairedLoopTimeRecord[] };

export function threadInput(input: SuiteLoopTimeInput): LoopTimeThreadInput {
  const scenarios = timedScenarios(input.scenarios);
  const ids = new Set(scenarios.map((s) => s.id));
  return {
    scenarios: scenarios.map(postedScenario),
    baseline: input.baseline,
    candidates: [...input.candidates],
    observed: [...input.observed].filter(([id]) => ids.has(id)),
  };
}

export function inputFromThread(posted: LoopTimeThreadInput): SuiteLoopTimeInput {
  return { scenarios: posted.scenarios.map(receivedScenario), baseline: posted.baseline, candidates: posted.candidates, observed: new Map(posted.observed) };
}

// From the TypeScript sources the thread needs the loader (loopTimeThread.mjs registers it).
const THREAD_URL = new URL(import.meta.url.endsWith('.ts') ? './loopTimeThread.mjs' : './loopTimeThread.js', import.meta.url);

/** A thread started ahead (warmLoopTimeThread), unreferenced until a measurement takes it. */
let parked: Worker | undefined;

/**
 * Starts the measurement's thread now, to be taken by measureSuiteLoopTimesInThread: its start-up
 * then overlaps the command's own instead of following the suite's runs.
 */
export function warmLoopTimeThread(): void {
  if (parked !== undefined) return;
  const worker = new Worker(THREAD_URL, { workerData: { warm: true } });
  worker.unref();
  const drop = () => {
    if (parked === worker) parked = undefined;
  };
  worker.once('error', drop);
  worker.once('exit', drop);
  parked = worker;
}

/**
 * The thread for `input`, the kept observations' buffers moved to it, not copied (this thread
 * does not read them again; a suite's are some 20 MB).
 */
function takeParked(input: LoopTimeThreadInput): Worker {
  const transferList = [...new Set(input.observed.map(([, packed]) => packed.values.buffer as ArrayBuffer))];
  const worker = parked;
  parked = undefined;
  if (worker === undefined) return new Worker(THREAD_URL, { workerData: input, transferList });
  worker.removeAllListeners('error');
  worker.removeAllListeners('exit');
  worker.ref();
  worker.postMessage(input, transferList);
  return worker;
}

/**
 * The measurement in a thread of its own (a warm one when there is one); the promise settles with
 * its records (log lines arrive on the way). A thread that fails to start or dies is reported like
 * a failed recording: a log line and no records, never a failed suite.
 */
export function measureSuiteLoopTimesInThread(input: SuiteLoopTimeInput, log: (line: string) => void): Promise<PairedLoopTimeRecord[]> {
  if (input.candidates.length === 0) return Promise.resolve([]);
  return new Promise((resolve) => {
    let settled = false;
    const done = (records: PairedLoopTimeRecord[], problem?: string) => {
      if (settled) return;
      settled = true;
      if (problem !== undefined) log(`loop time: not judged, its thread failed (${problem})`);
      resolve(records);
      void worker.terminate();
    };
    const worker = takeParked(threadInput(input));
    worker.on('message', (message: LoopTimeThreadMessage) => {
      if (message.kind === 'log') log(message.line);
      else done(message.records);
    });
    worker.on('error', (error) => done([], error.message));
    worker.on('exit', (code) => done([], `it exited with code ${code} before reporting`));
  });
}
