// How a run's own verdict changed between the baseline and the candidate. Only what the candidate
// changed should block a merge: a scenario that already fails on the baseline is inherited, and a
// gate that blocks every merge for it gets switched off.

import type { RunStatus } from '../results/types.js';

export type RunChange = 'passing' | 'new-failure' | 'still-failing' | 'fixed';

export const RUN_CHANGES: readonly RunChange[] = ['new-failure', 'still-failing', 'fixed', 'passing'];

/** `fail` and `error` both count as failing; an error where the baseline failed is no new failure. */
export function classifyRunChange(baseline: RunStatus, candidate: RunStatus): RunChange {
  const baseFails = baseline !== 'pass';
  const candFails = candidate !== 'pass';
  if (baseFails && candFails) return 'still-failing';
  if (candFails) return 'new-failure';
  if (baseFails) return 'fixed';
  return 'passing';
}
