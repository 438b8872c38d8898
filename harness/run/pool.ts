// The worker pool that runs pairs in parallel (piscina over worker_threads). A run that exceeds
// its wall-clock allowance is aborted, which terminates its worker: an in-process build stuck in
// an endless loop cannot block the suite.

import { Piscina } from 'piscina';
import type { RunTask } from './runOne.js';
import type { RunResult } from '../results/types.js';

const WORKER_URL = new URL('./workerEntry.mjs', import.meta.url);

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
