// A small real run for the report tests: two short scenarios (a shaped friction floor and a
// hostile title) through two reference builds and a process build that crashes with markup on
// its stderr. About 2 s with --jobs 1.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { runSuite } from '../../harness/commands/run.js';
import type { ResultsFile } from '../../harness/results/types.js';

export const FIXTURES = 'test/report/fixtures';
export const HOSTILE_TITLE = '<script>alert(1)</script>';
export const HOSTILE_STDERR = '<b>bold</b> <img src=x onerror="alert(2)"> </pre><script>alert(4)</script>';

export async function smallRun(): Promise<{ dir: string; results: ResultsFile }> {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-report-'));
  const outcome = await runSuite({
    paths: [`${FIXTURES}/floor`, `${FIXTURES}/hostile`],
    builds: ['ref:nominal', 'ref:governed', `broken=exec:node ${FIXTURES}/hostile/stderr-build.mjs`],
    outDir: dir,
    jobs: 1,
    quiet: true,
    baseline: 'nominal',
  });
  if (!outcome.results) throw new Error(`small run failed: ${outcome.lines.join('\n')}`);
  return { dir, results: outcome.results };
}
