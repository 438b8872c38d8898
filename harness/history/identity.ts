// The identity of a results set: a SHA-256 of its canonical JSON (keys sorted, so a re-indented
// or re-ordered copy of the same results is the same night). Two runs of the same commit are two
// nights — their start times and wall times differ — and adding one file twice changes nothing.

import { createHash } from 'node:crypto';
import type { ResultsFile } from '../results/types.js';

function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const keys = Object.keys(value as Record<string, unknown>).filter((k) => (value as Record<string, unknown>)[k] !== undefined).sort();
    return `{${keys.map((k) => `${JSON.stringify(k)}:${canonical((value as Record<string, unknown>)[k])}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

export function resultsIdentity(results: ResultsFile): string {
  return createHash('sha256').update(canonical(results)).digest('hex');
}

/**
 * The commit a night is filed under when none is given: the first build's that names one (a
 * nightly of `main` and `HEAD` builds is filed under the first listed; each build's own commit is
 * kept beside it). The nightly script passes the checkout's HEAD explicitly.
 */
export function nightCommit(results: ResultsFile): string | null {
  const commits = results.builds.map((b) => (typeof b.commit === 'string' && b.commit !== '' ? b.commit : null)).filter((c): c is string => c !== null);
  return commits[0] ?? null;
}
