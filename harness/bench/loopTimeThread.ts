// Worker entry: the gate's loop-time measurement of a suite run in a thread of its own
// (suiteLoopTime.ts measureSuiteLoopTimesInThread); log lines and then the records go to the parent.

import { parentPort, workerData } from 'node:worker_threads';
import { inputFromThread, measureSuiteLoopTimes, type LoopTimeThreadInput, type LoopTimeThreadMessage } from './suiteLoopTime.js';

const port = parentPort;
async function serve(input: LoopTimeThreadInput): Promise<void> {
  const post = (message: LoopTimeThreadMessage) => port?.postMessage(message);
  const records = await measureSuiteLoopTimes(inputFromThread(input), (line) => post({ kind: 'log', line }));
  post({ kind: 'records', records });
}
// A warm thread (suiteLoopTime.ts warmLoopTimeThread) gets its input posted, else it comes as workerData.
if (port !== null) {
  if ((workerData as { warm?: boolean })?.warm === true) port.once('message', (input: LoopTimeThreadInput) => void serve(input));
  else await serve(workerData as LoopTimeThreadInput);
}
