// The thread a module build runs in, alone (opened by open.ts from a run's thread). It opens the
// build with the ordinary in-process guard (loader.ts), reports its telemetry names, then serves
// ticks through shared memory (layout.ts): wait for TICK, read the observation, tick, write the
// action and the tick's wall time, DONE. Whatever the build does to this thread's globals, the
// plant and scorer live in another thread it has no reference to.

import { parentPort, workerData } from 'node:worker_threads';
import { createAction, createObservation, type ControllerSetup } from '../interface.js';
import { BuildFailure, openBuild, type OpenedBuild } from '../loader.js';
import type { BuildSpec } from '../spec.js';
import { BUILD_FAILURE_REASONS } from '../process/failure.js';
import { CLOSE, DONE, FAILED, IDLE, readObservation, STATE, viewSharedTick, writeAction, writeError, type BuildThreadMessage, type SharedTick } from './layout.js';

export type { BuildThreadMessage } from './layout.js';

let current: SharedTick | null = null;

interface Start {
  spec: BuildSpec;
  setup: ControllerSetup;
}

export function failureCode(error: unknown): number {
  return error instanceof BuildFailure ? BUILD_FAILURE_REASONS.indexOf(error.reason) : BUILD_FAILURE_REASONS.indexOf('threw');
}

async function serve(start: Start, post: (message: BuildThreadMessage) => void, port: NonNullable<typeof parentPort>): Promise<void> {
  let build: OpenedBuild;
  try {
    build = await openBuild(start.spec, start.setup);
  } catch (error) {
    const failure = error instanceof BuildFailure ? error : null;
    post({ kind: 'failed', reason: failure?.reason ?? 'threw', message: (error as Error)?.message ?? String(error), stderrTail: failure?.stderrTail ?? '' });
    return;
  }
  const sharedBuffer = await new Promise<SharedArrayBuffer>((resolve) => {
    port.once('message', (message: { buffer: SharedArrayBuffer }) => resolve(message.buffer));
    post({ kind: 'ready', telemetryNames: [...build.telemetryNames] });
  });
  const n = start.setup.robot.hips_m.length;
  const shared = viewSharedTick(sharedBuffer, n, build.telemetryNames.length);
  current = shared;
  const obs = createObservation(n);
  const action = createAction(n, build.telemetryNames.length);
  for (;;) {
    let state = Atomics.load(shared.control, STATE);
    // Sleep until the run's thread asks: after DONE/FAILED it resets to IDLE, then sets TICK.
    while (state === IDLE || state === DONE || state === FAILED) {
      Atomics.wait(shared.control, STATE, state);
      state = Atomics.load(shared.control, STATE);
    }
    if (state === CLOSE) break;
    readObservation(obs, shared.obs, n);
    try {
      const pending = build.tick(obs, action);
      if (pending !== undefined) await pending;
      writeAction(shared.action, action, build.loopTime_us);
      Atomics.store(shared.control, STATE, DONE);
    } catch (error) {
      writeError(shared, failureCode(error), (error as Error)?.message ?? String(error));
      Atomics.store(shared.control, STATE, FAILED);
    }
    Atomics.notify(shared.control, STATE);
  }
  await build.close().catch(() => undefined);
}

if (parentPort !== null && workerData?.spec !== undefined) {
  const port = parentPort;
  // An error the build leaves to this thread's event loop (during an async tick) fails the tick
  // in progress instead of leaving the run's thread waiting.
  const failFromOutside = (error: unknown) => {
    const shared = current;
    if (shared === null) throw error;
    writeError(shared, BUILD_FAILURE_REASONS.indexOf('threw'), `uncaught in the build's thread: ${(error as Error)?.message ?? String(error)}`);
    Atomics.store(shared.control, STATE, FAILED);
    Atomics.notify(shared.control, STATE);
  };
  process.on('uncaughtException', failFromOutside);
  process.on('unhandledRejection', failFromOutside);
  await serve(workerData as Start, (message) => port.postMessage(message), port);
  port.close();
}
