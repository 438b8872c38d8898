// The worker pool that runs pairs in parallel (piscina over worker_threads). A run that exceeds
// its wall-clock allowance is aborted, which terminates its worker: an in-process build stuck in
// an endless loop cannot block the suite.

import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { createErrorRunResult } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';
import type { RunTask } from './runOne.js';

const WORKER_URL = new URL('./workerEntry.mjs', import.meta.url);

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

export interface RunPool {
  run(task: RunTask, timeout_s: number): Promise<RunResult>;
  close(): Promise<void>;
}

export class RunTimeoutError extends Error {
  constructor(readonly timeout_s: number) {
    super(`the run exceeded its wall-clock allowance of ${timeout_s.toFixed(0)} s and was stopped`);
    this.name = 'RunTimeoutError';
  }
}

export function createRunPool(jobs: number): RunPool {
  const pool = new Piscina({
    filename: WORKER_URL.href,
    minThreads: 1,
    maxThreads: Math.max(1, jobs),
    idleTimeout: 60_000,
    // Each worker runs one pair at a time: a pair is seconds of CPU, never I/O bound.
    concurrentTasksPerWorker: 1,
  });
  return {
    async run(task, timeout_s) {
      const abort = new AbortController();
      const timer = setTimeout(() => abort.abort(new RunTimeoutError(timeout_s)), timeout_s * 1000);
      try {
        return (await pool.run(task, { signal: abort.signal })) as RunResult;
      } catch (error) {
        if (abort.signal.aborted) throw new RunTimeoutError(timeout_s);
        throw error;
      } finally {
        clearTimeout(timer);
      }
    },
    async close() {
      await pool.destroy();
    },
  };
}

/**
 * One pair on the pool with its allowance; a timeout or a crashed worker becomes that pair's
 * `error` result (run-timeout / worker), never an exception for the suite.
 */
export async function runOnPool(pool: RunPool, task: RunTask, timeout: RunTimeout): Promise<RunResult> {
  try {
    return await pool.run(task, runAllowance_s(timeout, task.scenario.duration_s));
  } catch (error) {
    const reason = error instanceof RunTimeoutError ? 'run-timeout' : 'worker';
    return createErrorRunResult(task.scenario, task.build.name, { message: (error as Error).message, reason });
  }
}
