// results.json: validated against its schema before it is written, so a file on disk always
// passes `validateResults`.

import { writeFileAtomicSync } from '../files/atomic.js';
import type { ResultsFile } from './types.js';
import { formatResultsIssues, validateResults } from './validate.js';

export function writeResultsJson(file: string, results: ResultsFile): void {
  const validation = validateResults(results);
  if (!validation.ok) {
    throw new Error(`refusing to write an invalid results file:\n${formatResultsIssues(file, validation.issues)}`);
  }
  writeFileAtomicSync(file, `${JSON.stringify(results, null, 2)}\n`);
}
