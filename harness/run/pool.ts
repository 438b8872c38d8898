// The pool that runs pairs in parallel on worker threads. Three promises it keeps:
// - a thread serves one build only (runThread.ts): after a healthy run (a result that is not an
//   `error`, no process group left behind) it takes the next queued run of the SAME build spec
//   (reference builds, the harness's own code, share: a reference build's thread takes any
//   reference build's run when its own has none queued), otherwise it is terminated; one that saw an uncaught error or an unhandled rejection dies
//   with its own run only and is never reused;
// - a run's wall-clock allowance starts when its thread says it started, never while it waits
//   for a free slot (at most `jobs` threads exist, the rest wait here, not in a thread's queue);
// - a run stopped from outside (its allowance, abort() on a signal, close()) has its thread
//   terminated and every process group it announced killed, so no build outlives its run.
// With one job, reference builds (bundled, trusted code) run in this thread instead (inProcess.ts):
// no thread start-up at all, the allowance kept by a watchdog between ticks.
// The price of a thread is its start-up (harness modules), measured in docs/bench.md; reuse pays it
// once per build and slot instead of once per run.

import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import { killProcessGroup } from '../builds/process/groups.js';
import { createErrorRunResult } from '../results/runResult.js';
import type { RunResult } from '../results/types.js';
import type { RunTask } from './runOne.js';
import { runInProcess } from './inProcess.js';
import { postedTask } from './sharedRaster.js';
import { attachObservations } from './observed.js';
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

// From the TypeScript sources the thread needs the loader (runThread.mjs registers it); the
// compiled build's runThread.js starts as it is.
const THREAD_URL = new URL(import.meta.url.endsWith('.ts') ? './runThread.mjs' : './runThread.js', import.meta.url);
/** A thread that has not even started its run after this long is stuck in start-up. */
const START_LIMIT_ms = 120_000;

/**
 * Threads started ahead of the pool (warmRunThreads), parked until a pool takes one: their start-up
 * (the harness modules) overlaps the command's own (loading the scenarios) instead of following it.
 * Unreferenced while parked, so an unused one never keeps the process alive.
 */
const parked: { url: string; worker: Worker }[] = [];

/** Starts threads until `count` are parked for the thread entry `threadUrl` (a later pool takes them). */
export function warmRunThreads(count: number, threadUrl: URL = THREAD_URL): void {
  const url = threadUrl.href;
  let have = parked.filter((p) => p.url === url).length;
  for (; have < count; have++) {
    const worker = new Worker(threadUrl, { workerData: { warm: true } });
    worker.unref();
    const entry = { url, worker };
    const drop = () => {
      const at = parked.indexOf(entry);
      if (at >= 0) parked.splice(at, 1);
    };
    // A parked thread that fails is only dropped; the pool starts a new one instead.
    worker.once('error', drop);
    worker.once('exit', drop);
    parked.push(entry);
  }
}

/** How many started threads wait for a pool (for the tests). */
export function parkedRunThreads(): number {
  return parked.length;
}

/** A parked thread for `threadUrl`, referenced again, or undefined. */
function takeParked(threadUrl: URL): Worker | undefined {
  const at = parked.findIndex((p) => p.url === threadUrl.href);
  if (at < 0) return undefined;
  const { worker } = parked.splice(at, 1)[0];
  worker.removeAllListeners('error');
  worker.removeAllListeners('exit');
  worker.ref();
  return worker;
}

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

export interface RunPoolOptions {
  /** The thread's entry (runThread); a test swaps in a thread that crashes on purpose. */
  threadUrl?: URL;
}

export function createRunPool(jobs: number, options: RunPoolOptions = {}): RunPool {
  const slots = Math.max(1, jobs);
  const threadUrl = options.threadUrl ?? THREAD_URL;
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
    if (slots === 1 && item.task.build.kind === 'reference') startInProcess(item);
    else startThread(item);
  }

  function startInProcess(item: Queued): void {
    const controller = new AbortController();
    const entry: Running = { stop: (error) => controller.abort(error) };
    running.add(entry);
    runInProcess(item.task, item.timeout_s, controller.signal)
      .then(
        // An overrun rejects like a thread run stopped by its allowance (runOnPool makes it run-timeout).
        (result) => (result === 'overrun' ? item.reject(new RunTimeoutError(item.timeout_s)) : item.resolve(result)),
        (error: Error) => item.reject(error),
      )
      .finally(() => {
        running.delete(entry);
        startNext();
      });
  }

  function startThread(first: Queued): void {
    let item = first;
    const mine = new Set<number>();
    let settled = false;
    let allowance: NodeJS.Timeout | undefined;
    let startLimit: NodeJS.Timeout | undefined;
    const warm = takeParked(threadUrl);
    warm?.postMessage({ task: postedTask(item.task) });
    const worker = warm ?? new Worker(threadUrl, { workerData: { task: postedTask(item.task) } });
    const entry: Running = { stop: (error) => finish(error) };
    running.add(entry);
    const awaitStart = () => {
      startLimit = setTimeout(() => finish(new RunThreadError(`it did not start within ${START_LIMIT_ms / 1000} s`)), START_LIMIT_ms);
    };
    awaitStart();

    function finish(outcome: RunResult | Error): void {
      if (settled) return;
      settled = true;
      clearTimeout(startLimit);
      clearTimeout(allowance);
      const done = item;
      // Healthy and the same build queued: the thread takes it, keeping its slot.
      const healthy = !(outcome instanceof Error) && outcome.status !== 'error' && mine.size === 0 && aborted === null;
      const next = healthy ? nextForThread(queue, done.task) : -1;
      if (next >= 0) {
        item = queue.splice(next, 1)[0];
        settled = false;
        awaitStart();
        worker.postMessage({ task: postedTask(item.task) });
      } else {
        running.delete(entry);
        void worker.terminate();
        // The thread's own clean-up closes its builds; whatever it could not (terminated, crashed) goes here.
        for (const pgid of mine) {
          killProcessGroup(pgid);
          groups.delete(pgid);
        }
      }
      if (outcome instanceof Error) done.reject(outcome);
      else done.resolve(outcome);
      if (next < 0) startNext();
    }

    worker.on('message', (message: RunThreadMessage) => {
      if (message.kind === 'started') {
        clearTimeout(startLimit);
        const current = item;
        allowance = setTimeout(() => finish(new RunTimeoutError(current.timeout_s)), current.timeout_s * 1000);
      } else if (message.kind === 'group') {
        const set = (s: Set<number>) => (message.alive ? s.add(message.pgid) : s.delete(message.pgid));
        set(mine);
        set(groups);
      } else {
        // The observations cross beside the result; the pool's caller finds them by the result.
        if (message.observations) attachObservations(message.result, message.observations);
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

/** One build spec: the same code with the same arguments, options and folder. */
/**
 * The queued run a healthy thread takes next: one of the same build spec, else — when it ran a
 * reference build — any reference build's (the bundled builds are the harness's own trusted code,
 * docs/protocol.md "Trust model": sharing a thread saves its start-up, nothing to isolate).
 */
function nextForThread(queue: readonly Queued[], done: RunTask): number {
  const same = queue.findIndex((queued) => sameBuild(queued.task, done));
  if (same >= 0 || done.build.kind !== 'reference') return same;
  return queue.findIndex((queued) => queued.task.build.kind === 'reference');
}

function sameBuild(a: RunTask, b: RunTask): boolean {
  const x = a.build;
  const y = b.build;
  return x.name === y.name && x.kind === y.kind && x.entry === y.entry && x.cwd === y.cwd && JSON.stringify([x.args, x.options]) === JSON.stringify([y.args, y.options]);
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
