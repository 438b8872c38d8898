// Measures the scorer's per-step and per-tick allocation in this process and prints it as JSON.
// Run by stepScoring.test.ts in a fresh process (see test/support/allocationProbe.ts for why).

import { createScorer } from '../../../harness/score/scorer.js';
import { measureSteadyAllocation } from '../../support/allocation.js';
import { makeScenario, standingSample } from '../fixtures.js';
import { setFoot, standingStep, STEP_s } from '../stepFixtures.js';

const scorer = createScorer(makeScenario({ duration_s: 3600 }));
const step = standingStep();
const tick = standingSample();
setFoot(step, 0, [3, 1, 32], [0.001, 0, 0]);
let k = 0;
const result = await measureSteadyAllocation(
  1_000_000,
  () => {
    step.time_s = ++k * STEP_s;
    scorer.recordStep(step, tick);
    if ((k & 1) === 0) scorer.record(tick);
  },
  (r) => r.collections === 0 && r.bytesPerCall < 1,
);
process.stdout.write(JSON.stringify(result));
