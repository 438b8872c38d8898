// The worker-thread side of the run pool (pool.ts): one thread runs exactly one (scenario × build)
// pair and is then thrown away, so nothing a build leaves behind — a patched prototype, a global,
// a timer, a pending rejection — reaches any other pair. Messages to the parent:
//   { kind: 'started' }                 the task arrived; the run's wall-clock allowance starts now
//   { kind: 'group', pgid, alive }      a process build's group started / is gone (pool kills leftovers)
//   { kind: 'result', result }          the RunResult
// An uncaught error or unhandled rejection (Node's default: it throws) ends the thread; the parent
// turns that into an error result for this pair only.

import { parentPort, workerData } from 'node:worker_threads';
import { setImmediate as nextTurn } from 'node:timers/promises';
import { watchProcessGroups } from '../builds/process/groups.js';
import { runOne, type RunTask } from './runOne.js';

export type RunThreadMessage =
  | { kind: 'started' }
  | { kind: 'group'; pgid: number; alive: boolean }
  | { kind: 'result'; result: Awaited<ReturnType<typeof runOne>> };

export async function serveOneRun(task: RunTask, post: (message: RunThreadMessage) => void): Promise<void> {
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
    post({ kind: 'result', result });
  } finally {
    stop();
  }
}

if (parentPort !== null && workerData?.task !== undefined) {
  const port = parentPort;
  await serveOneRun(workerData.task as RunTask, (message) => port.postMessage(message));
}
