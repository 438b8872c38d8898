// The pool that runs pairs in parallel on worker threads. Three promises it keeps:
// - a fresh thread per run (runThread.ts): a thread never serves two pairs, let alone two builds,
//   and one that saw an uncaught error or an unhandled rejection dies with its own run only;
// - a run's wall-clock allowance starts when its thread says it started, never while it waits
//   for a free slot (at most `jobs` threads exist, the rest wait here, not in a thread's queue);
// - a run stopped from outside (its allowance, abort() on a signal, close()) has its thread
//   terminated and every process group it announced killed, so no build outlives its run.
// The price of a fresh thread is its start-up (loader and harness modules), measured in
// docs/protocol.md ("Trust model"); it is paid in parallel with the other runs.

import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import { killProcessGroup } from '../builds/process/groups.js';
import { createErrorRunResult } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';
import type { RunTask } from './runOne.js';
import type { RunThreadMessage } from './runThread.js';

/** Wall-clock allowance of one run: base + factor × simulated duration (seconds). */
export interface RunTimeout {
  base_s: number;
  perSimulatedSecond: number;
}

/** Generous on purpose: it catches a hung build, it is no speed test (common practice). */
export const DEFAULT_RUN_TIMEOUT: RunTimeout = Object.freeze({ base_s: 120, perSimulatedSecond: 30 });

export function runAllowance_s(timeout: RunTimeout, duration_s: number): number {
  return timeout.base_s + timeout.perSimulatedSecond * duration_s;
}

/** One worker per core unless told otherwise. */
export function defaultJobs(): number {
  return Math.max(1, availableParallelism());
}

const THREAD_URL = new URL('./runThread.mjs', import.meta.url);
/** A thread that has not even started its run after this long is stuck in start-up. */
const START_LIMIT_ms = 120_000;

export interface RunPool {
  run(task: RunTask, timeout_s: number): Promise<RunResult>;
  /** Stops everything at once (a signal): queued runs and running ones reject with RunInterruptedError. */
  abort(reason: string): void;
  close(): Promise<void>;
}

export class RunTimeoutError extends Error {
  constructor(readonly timeout_s: number) {
    super(`the run exceeded its wall-clock allowance of ${timeout_s.toFixed(0)} s and was stopped`);
    this.name = 'RunTimeoutError';
  }
}

/** The run's thread died (uncaught error, unhandled rejection, out of memory) before its result. */
export class RunThreadError extends Error {
  constructor(detail: string) {
    super(`the run's worker thread failed and was discarded: ${detail}`);
    this.name = 'RunThreadError';
  }
}

export class RunInterruptedError extends Error {
  constructor(reason: string) {
    super(`the run was interrupted (${reason}) before it finished`);
    this.name = 'RunInterruptedError';
  }
}

interface Queued {
  task: RunTask;
  timeout_s: number;
  resolve(result: RunResult): void;
  reject(error: Error): void;
}

interface Running {
  stop(error: Error): void;
}

export function createRunPool(jobs: number): RunPool {
  const slots = Math.max(1, jobs);
  const queue: Queued[] = [];
  const running = new Set<Running>();
  /** Every process group a running thread announced and did not yet report gone. */
  const groups = new Set<number>();
  let aborted: string | null = null;
  const killAll = () => {
    for (const pgid of groups) killProcessGroup(pgid);
  };
  process.on('exit', killAll);

  const startNext = () => {
    while (running.size < slots && queue.length > 0) start(queue.shift() as Queued);
  };

  function start(item: Queued): void {
    const mine = new Set<number>();
    let settled = false;
    let allowance: NodeJS.Timeout | undefined;
    const worker = new Worker(THREAD_URL, { workerData: { task: item.task } });
    const startLimit = setTimeout(() => finish(new RunThreadError(`it did not start within ${START_LIMIT_ms / 1000} s`)), START_LIMIT_ms);
    const entry: Running = { stop: (error) => finish(error) };
    running.add(entry);

    function finish(outcome: RunResult | Error): void {
      if (settled) return;
      settled = true;
      clearTimeout(startLimit);
      clearTimeout(allowance);
      running.delete(entry);
      void worker.terminate();
      // The thread's own clean-up closes its builds; whatever it could not (terminated, crashed) goes here.
      for (const pgid of mine) {
        killProcessGroup(pgid);
        groups.delete(pgid);
      }
      if (outcome instanceof Error) item.reject(outcome);
      else item.resolve(outcome);
      startNext();
    }

    worker.on('message', (message: RunThreadMessage) => {
      if (message.kind === 'started') {
        clearTimeout(startLimit);
        allowance = setTimeout(() => finish(new RunTimeoutError(item.timeout_s)), item.timeout_s * 1000);
      } else if (message.kind === 'group') {
        const set = (s: Set<number>) => (message.alive ? s.add(message.pgid) : s.delete(message.pgid));
        set(mine);
        set(groups);
      } else {
        finish(message.result);
      }
    });
    worker.on('error', (error) => finish(new RunThreadError(describe(error))));
    worker.on('exit', (code) => finish(new RunThreadError(`it exited with code ${code} before reporting a result`)));
  }

  return {
    run(task, timeout_s) {
      if (aborted !== null) return Promise.reject(new RunInterruptedError(aborted));
      return new Promise<RunResult>((resolve, reject) => {
        queue.push({ task, timeout_s, resolve, reject });
        startNext();
      });
    },
    abort(reason) {
      if (aborted !== null) return;
      aborted = reason;
      for (const item of queue.splice(0)) item.reject(new RunInterruptedError(reason));
      for (const entry of [...running]) entry.stop(new RunInterruptedError(reason));
      killAll();
    },
    async close() {
      for (const item of queue.splice(0)) item.reject(new RunInterruptedError('the pool was closed'));
      for (const entry of [...running]) entry.stop(new RunInterruptedError('the pool was closed'));
      killAll();
      process.off('exit', killAll);
    },
  };
}

function describe(error: unknown): string {
  if (error instanceof Error) return `${error.name === 'Error' ? '' : `${error.name}: `}${error.message}`;
  return String(error);
}

/**
 * One pair on the pool with its allowance; a timeout or a crashed thread becomes that pair's
 * `error` result (run-timeout / worker), never an exception for the suite. An interruption (a
 * signal) is passed on: the suite stops, it does not record the pair.
 */
export async function runOnPool(pool: RunPool, task: RunTask, timeout: RunTimeout): Promise<RunResult> {
  try {
    return await pool.run(task, runAllowance_s(timeout, task.scenario.duration_s));
  } catch (error) {
    if (error instanceof RunInterruptedError) throw error;
    const reason = error instanceof RunTimeoutError ? 'run-timeout' : 'worker';
    return createErrorRunResult(task.scenario, task.build.name, { message: (error as Error).message, reason });
  }
}
