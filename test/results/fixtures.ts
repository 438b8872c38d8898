// Result sets made by really scoring hand-made samples (no hand-typed metric objects).

import { createErrorRunResult, createResultsFile, createRunResult } from '../../harness/results/runResult.js';
import type { ResultsFile, RunResult } from '../../harness/results/types.js';
import { createScorer } from '../../harness/score/scorer.js';
import type { ResolvedScenario } from '../../harness/scenario/types.js';
import { drive, makeScenario, standingSample } from '../score/fixtures.js';

export const MACHINE = { cores: 2, nodeVersion: 'v20.0.0', platform: 'linux', arch: 'x64', cpuModel: 'test cpu' };

/** Scores 1000 ticks of standing with foot 0 at tangential force `fx_N` and speed `v_mps`. */
export function scoredRun(
  scenario: ResolvedScenario,
  build: string,
  opts: { fx_N?: number; v_mps?: number; fallAt?: number; loop_us?: number; wantedFx_N?: number } = {},
): RunResult {
  const scorer = createScorer(scenario);
  drive((s) => scorer.record(s), standingSample(), 1000, (s, k) => {
    s.footForce_N.set([opts.fx_N ?? 0, 0, 32], 0);
    s.wantedForce_N.set([opts.wantedFx_N ?? 0, 0, 32], 0);
    s.footVelocity_mps.set([opts.v_mps ?? 0, 0, 0], 0);
    s.loopTime_us = opts.loop_us ?? 100;
    if (opts.fallAt !== undefined && k >= opts.fallAt) s.trunkPosition_m[2] = 0.05;
  });
  return createRunResult(scenario, build, scorer.finish({ wall_s: 0.2 }));
}

export function sampleResults(): ResultsFile {
  const walk = makeScenario({
    id: 'slippery-walk',
    title: 'Walk <over> "ice" & | pipes',
    acceptance: { mustNotFall: true, minFrictionMargin: 0.2, maxSlipDistance_m: 0.05, maxCommandedViolations: 0, minProgress: null },
  });
  const stand = makeScenario({ id: 'quiet-stand', hash: 'b'.repeat(64) });
  return createResultsFile({
    toolVersion: '0.1.0',
    startedAt: '2030-01-02T03:04:05.000Z',
    machine: MACHINE,
    builds: [
      { name: 'ref:governed', kind: 'module', entry: 'builds/governed.ts', commit: 'abc123', dirty: false },
      { name: 'ref:trusting', kind: 'module', entry: 'builds/trusting.ts', commit: null, dirty: null },
    ],
    runs: [
      scoredRun(walk, 'ref:governed', { fx_N: 4 }),
      scoredRun(stand, 'ref:governed'),
      scoredRun(walk, 'ref:trusting', { fx_N: 14, v_mps: 0.1, wantedFx_N: 20 }),
      createErrorRunResult(stand, 'ref:trusting', { message: 'build process exited with code 3', time_s: 0.5, reason: 'crash', stderrTail: 'panic: <boom> & "done"' }),
    ],
  });
}
