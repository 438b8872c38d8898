// Worker entry: the harness overhead per tick (targets.ts harnessOverheadPerTick_us) measured in a
// thread of its own, as a run thread serves one build (run/pool.ts). In the bench's own thread the
// episode loop has first run every benched build's episodes, and the no-op episode then pays for
// their call sites and plant paths (docs/bench.md, "The harness hot loop, second pass").

import { parentPort, workerData } from 'node:worker_threads';
import type { ResolvedScenario } from '../scenario/types.js';
import type { TaskBudget } from './batch.js';
import { harnessOverheadPerTick_us } from './targets.js';

const { scenario, budget } = workerData as { scenario: ResolvedScenario; budget: TaskBudget };
parentPort?.postMessage(await harnessOverheadPerTick_us(scenario, budget));
