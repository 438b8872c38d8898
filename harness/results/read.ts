// Reading a results set back: a results.json file, or a folder holding one. Every failure names
// the path and what was expected (the gate turns these into exit code 2).

import { statSync } from 'node:fs';
import { readBoundedTextSync } from '../files/bounded.js';
import { join } from 'node:path';
import { migrateResults } from './migrate.js';
import { RESULTS_FILE_NAME, type ResultsFile } from './types.js';
import { formatResultsIssues, validateResults } from './validate.js';

export class ResultsReadError extends Error {
  constructor(
    readonly file: string,
    message: string,
  ) {
    super(message);
    this.name = 'ResultsReadError';
  }
}

/** Resolves a results.json path or a folder containing one. */
export function resolveResultsPath(path: string): string {
  let stats;
  try {
    stats = statSync(path);
  } catch {
    throw new ResultsReadError(path, `${path}: no such file or folder (expected a ${RESULTS_FILE_NAME} or a folder holding one)`);
  }
  if (!stats.isDirectory()) return path;
  const file = join(path, RESULTS_FILE_NAME);
  try {
    if (statSync(file).isFile()) return file;
  } catch {
    // fall through
  }
  throw new ResultsReadError(path, `${path}: folder holds no ${RESULTS_FILE_NAME}`);
}

export function readResultsFile(path: string): { file: string; results: ResultsFile } {
  const file = resolveResultsPath(path);
  let text: string;
  try {
    text = readBoundedTextSync(file);
  } catch (error) {
    throw new ResultsReadError(file, `${file}: cannot read (${(error as Error).message})`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (error) {
    throw new ResultsReadError(file, `${file}: not valid JSON (${(error as Error).message})`);
  }
  // Older formats are migrated in memory; the file on disk is never rewritten.
  const validation = validateResults(migrateResults(value).value);
  if (!validation.ok) {
    throw new ResultsReadError(file, `${file}: not a Footing results file:\n${formatResultsIssues(file, validation.issues)}`);
  }
  return { file, results: validation.value };
}
