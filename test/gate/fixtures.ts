import { createErrorRunResult, createResultsFile } from '../../harness/results/runResult.js';
import type { ResultsFile, RunResult } from '../../harness/results/types.js';
import { makeScenario } from '../score/fixtures.js';
import { MACHINE, scoredRun } from '../results/fixtures.js';

export const walk = makeScenario({ id: 'ice-walk' });
export const stand = makeScenario({ id: 'quiet-stand', hash: 'b'.repeat(64) });
export const walkChanged = makeScenario({ id: 'ice-walk', revision: 2, hash: 'c'.repeat(64) });

export { scoredRun };

export function results(runs: RunResult[]): ResultsFile {
  const names = [...new Set(runs.map((r) => r.build))];
  return createResultsFile({
    toolVersion: '0.1.0',
    startedAt: '2030-01-02T03:04:05.000Z',
    machine: MACHINE,
    builds: names.map((name) => ({ name })),
    runs,
  });
}

export function errorRun(build: string): RunResult {
  return createErrorRunResult(walk, build, { message: 'controller threw: bad gain', time_s: 0.2 });
}
