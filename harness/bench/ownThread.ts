// Worker entry: a bench figure measured in a thread of its own, as a run thread serves one build
// (run/pool.ts). In the bench's own thread the episode loop has first run every benched build's
// episodes, and a later episode then pays for their call sites and plant paths (docs/bench.md,
// "The harness hot loop, second pass"): the harness overhead per tick (targets.ts
// harnessOverheadPerTick_us) and a build's steady closed loop (measure.ts steadyClosedLoop).

import { parentPort, workerData } from 'node:worker_threads';
import { steadyClosedLoop } from './measure.js';
import { harnessOverheadPerTick_us } from './targets.js';
import type { OwnThreadTask } from './types.js';

const job = workerData as OwnThreadTask;
parentPort?.postMessage(job.task === 'overhead'
  ? await harnessOverheadPerTick_us(job.scenario, job.budget)
  : await steadyClosedLoop(job.scenario, job.spec, job.budget));
