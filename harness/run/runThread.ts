// The worker-thread side of the run pool (pool.ts): a thread runs (scenario × build) pairs of ONE
// build (or of the reference builds, which share threads: our own trusted code), one at a time: the first from workerData, each further one posted by the pool while the
// thread stays healthy. So nothing a build leaves behind — a patched prototype, a global, a timer,
// a pending rejection — reaches another build's run. Messages to the parent:
//   { kind: 'started' }                 a task arrived; the run's wall-clock allowance starts now
//   { kind: 'group', pgid, alive }      a process build's group started / is gone (pool kills leftovers)
//   { kind: 'result', result }          the RunResult
// Messages from the parent: { task } (the next run, same build; a warm thread's first run). An uncaught error or unhandled
// rejection (Node's default: it throws) ends the thread; the parent turns that into an error
// result for the pair in progress and never reuses the thread.

import { parentPort, workerData } from 'node:worker_threads';
import { setImmediate as nextTurn } from 'node:timers/promises';
import { watchProcessGroups } from '../builds/process/groups.js';
import { runOne, type RunTask } from './runOne.js';
import { receivedTask, type PostedTask } from './sharedRaster.js';
import { observationsOf } from './observed.js';
import type { PackedObservations } from '../contract/packed.js';

export type RunThreadMessage =
  | { kind: 'started' }
  | { kind: 'group'; pgid: number; alive: boolean }
  | { kind: 'result'; result: Awaited<ReturnType<typeof runOne>>; observations?: PackedObservations };

export async function serveOneRun(task: RunTask, post: (message: RunThreadMessage, transfer?: ArrayBuffer[]) => void): Promise<void> {
  const stop = watchProcessGroups({
    started: (pgid) => post({ kind: 'group', pgid, alive: true }),
    gone: (pgid) => post({ kind: 'group', pgid, alive: false }),
  });
  post({ kind: 'started' });
  try {
    const result = await runOne(task);
    // One more turn of the event loop: a rejection the build left unhandled surfaces now and
    // fails this run (the thread dies before the result is posted), not some later pair.
    await nextTurn();
    const observations = observationsOf(result);
    // The packed observations' buffer is moved, not copied (the thread is done with it).
    if (observations) post({ kind: 'result', result, observations }, [observations.values.buffer as ArrayBuffer]);
    else post({ kind: 'result', result });
  } finally {
    stop();
  }
}

if (parentPort !== null && (workerData?.task !== undefined || workerData?.warm === true)) {
  const port = parentPort;
  const post = (message: RunThreadMessage, transfer?: ArrayBuffer[]) => port.postMessage(message, transfer);
  // Runs are served strictly one after another: the pool posts the next only after a result.
  // A raster's grids arrive in shared memory (sharedRaster.ts), posted once per raster. A warm
  // thread (pool.ts warmRunThreads) starts with no task and gets its first one posted.
  let chain = workerData.task !== undefined ? serveOneRun(receivedTask(workerData.task as PostedTask), post) : Promise.resolve();
  port.on('message', (message: { task: PostedTask }) => {
    chain = chain.then(() => serveOneRun(receivedTask(message.task), post));
  });
}
