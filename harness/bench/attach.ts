// `footing run --bench`: the bench figures ride along in results.json as the optional top-level
// field `bench` (results.schema.json accepts it; bench.schema.json is its full schema), so the
// report and the gate read them from the same file as the runs.

import type { ResultsFile } from '../results/types.js';
import type { BenchReport } from './types.js';
import { validateBench } from './validate.js';

/** Returns a copy of `results` with `bench` attached; refuses figures that do not match their schema. */
export function attachBench(results: ResultsFile, bench: BenchReport): ResultsFile {
  const checked = validateBench(bench);
  if (!checked.ok) throw new Error(`attachBench: the bench figures do not match bench.schema.json: ${checked.issues.slice(0, 5).join('; ')}`);
  return { ...results, bench: bench as unknown as NonNullable<ResultsFile['bench']> };
}

