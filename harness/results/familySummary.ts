// A family's score from its sample runs: success rate with a Wilson interval (proportion.ts) and the
// spread of friction margin and slip distance over the samples. Computed whenever a results file is
// assembled (createResultsFile), so shards and merges summarise what they hold.

import { createHash } from 'node:crypto';
import type { RunResult } from './types.js';
import { wilsonInterval } from '../score/proportion.js';
import type { FamilySummary, Spread } from './margin.js';

/** Confidence of the intervals stored in results.json (the gate recomputes at its policy's). */
export const FAMILY_CONFIDENCE = 0.95;

/** Quantile by linear interpolation between order statistics (Hyndman & Fan 1996, type 7). */
export function quantile(sorted: readonly number[], q: number): number {
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export function spread(values: readonly (number | null | undefined)[]): Spread | null {
  const present = values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v)).sort((a, b) => a - b);
  if (present.length === 0) return null;
  return {
    count: present.length,
    min: present[0],
    p10: quantile(present, 0.1),
    median: quantile(present, 0.5),
    p90: quantile(present, 0.9),
    max: present[present.length - 1],
  };
}

/** One summary per (family, build), in order of first appearance in `runs`. */
export function summarizeFamilies(runs: readonly RunResult[]): FamilySummary[] {
  const groups = new Map<string, RunResult[]>();
  for (const run of runs) {
    const family = run.scenario.family;
    if (!family) continue;
    const key = `${family.id}\u0000${run.build}`;
    const group = groups.get(key);
    if (group) group.push(run);
    else groups.set(key, [run]);
  }
  const summaries: FamilySummary[] = [];
  for (const group of groups.values()) {
    const members = [...group].sort((a, b) => a.scenario.family!.sample - b.scenario.family!.sample);
    const first = members[0];
    const successes = members.filter((r) => r.status === 'pass').length;
    const interval = wilsonInterval(successes, members.length, FAMILY_CONFIDENCE);
    const hash = createHash('sha256');
    for (const r of members) hash.update(`${r.scenario.family!.sample}:${r.scenario.hash}\n`);
    const summary: FamilySummary = {
      id: first.scenario.family!.id,
      build: first.build,
      file: first.scenario.file,
      samples: first.scenario.family!.samples,
      runs: members.length,
      successes,
      errors: members.filter((r) => r.status === 'error').length,
      successRate: successes / members.length,
      interval: { method: 'wilson', confidence: FAMILY_CONFIDENCE, lower: interval.lower, upper: interval.upper },
      hash: hash.digest('hex'),
      frictionMarginMin: spread(members.map((r) => r.metrics?.frictionMargin.min)),
      slipDistance_m: spread(members.map((r) => r.metrics?.slipDistance_m)),
    };
    if (members.some((r) => r.margin?.friction)) summary.criticalFrictionScale = spread(members.map((r) => r.margin?.friction?.criticalScale));
    summaries.push(summary);
  }
  return summaries;
}
