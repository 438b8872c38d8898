// A run in the calling thread, for `--jobs 1` with a reference build: the bundled controllers are
// our own code (no isolation to buy), so the run skips a worker's start-up (loading the harness
// again, compiling the schemas again). The wall-clock allowance is kept by a watchdog that every
// WATCH_EVERY ticks compares the clock with the deadline (the episode is synchronous for in-process
// builds, so a timer could not fire during it); a run past its allowance, or stopped from outside
// (abort signal), ends at that tick; a signal (SIGINT/SIGTERM) is seen between runs, so one in
// flight finishes (or meets its allowance) first. It cannot stop a tick that never returns: that is why only
// reference builds, whose ticks are bounded (fixed solver iteration limits), run here.

import { setImmediate as nextTurn } from 'node:timers/promises';
import type { TickObserver } from '../score/sample.js';
import type { RunResult } from '../results/types.js';
import type { RunTask } from './runOne.js';

/** Ticks between two looks at the clock: 1/4 s of a 1 kHz run, a few µs of work (common practice). */
const WATCH_EVERY = 256;

class WatchdogStop extends Error {}

/** The run's result, or 'overrun' when the watchdog stopped it at its allowance. */
export async function runInProcess(task: RunTask, timeout_s: number, signal: AbortSignal): Promise<RunResult | 'overrun'> {
  // A full turn of the event loop before each run: a signal or timer that arrived during the last
  // run is handled now (this thread's episode gives none until it ends).
  await nextTurn();
  if (signal.aborted) throw signal.reason as Error;
  // Loaded on first use: a command that never runs in-process does not import the episode graph.
  const { runOne } = await import('./runOne.js');
  const deadline_ms = performance.now() + timeout_s * 1000;
  let ticks = 0;
  let overrun = false;
  const watchdog: TickObserver = {
    onTick() {
      if (++ticks % WATCH_EVERY !== 0) return;
      if (signal.aborted) throw new WatchdogStop('stopped');
      if (performance.now() > deadline_ms) {
        overrun = true;
        throw new WatchdogStop('allowance');
      }
    },
  };
  const result = await runOne(task, [watchdog]);
  await nextTurn();
  if (signal.aborted) throw signal.reason as Error;
  return overrun ? 'overrun' : result;
}
