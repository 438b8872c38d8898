// Gate rule on seeded families: a family's success rate may not drop with statistical support.
// The test is Newcombe's hybrid score interval for the difference of two proportions (Newcombe
// 1998, Statistics in Medicine 17:873, method 10, built from the two Wilson intervals): the drop
// baseline − candidate is supported when its whole interval lies above the allowed drop. A move
// whose interval reaches the allowance is reported as "within noise", not as a regression.

import { summarizeFamilies } from '../results/familySummary.js';
import { differenceInterval, wilsonInterval } from '../score/proportion.js';
import type { FamilySummary } from '../results/margin.js';
import type { ResultsFile } from '../results/types.js';
import { rulesFor, type GatePolicy } from './defaults.js';
import type { GateRow, NotComparable } from './types.js';

export interface FamilyComparison {
  rows: GateRow[];
  notComparable: NotComparable[];
  /** Family ids compared (for the gate's count). */
  compared: number;
}

function families(results: ResultsFile): FamilySummary[] {
  // Summaries are recomputed from the runs: they are derived data and the runs are the truth.
  return summarizeFamilies(results.runs);
}

function rate(f: FamilySummary, confidence: number): string {
  const w = wilsonInterval(f.successes, f.runs, confidence);
  return `${f.successes}/${f.runs} = ${f.successRate.toFixed(2)} [${w.lower.toFixed(2)}, ${w.upper.toFixed(2)}]`;
}

export function compareFamilies(baseline: ResultsFile, candidate: ResultsFile, buildPairs: [string, string][], policy: GatePolicy): FamilyComparison {
  const rows: GateRow[] = [];
  const notComparable: NotComparable[] = [];
  let compared = 0;
  const base = families(baseline);
  const cand = families(candidate);
  for (const [baseBuild, candBuild] of buildPairs) {
    for (const b of base.filter((f) => f.build === baseBuild)) {
      const c = cand.find((f) => f.build === candBuild && f.id === b.id);
      if (!c) continue;
      if (c.hash !== b.hash) {
        notComparable.push({
          scenario: b.id, baselineBuild: baseBuild, candidateBuild: candBuild, baselineHash: b.hash, candidateHash: c.hash,
          reason: `family samples differ (${b.runs} vs ${c.runs} sample runs, or the family's content changed)`,
        });
        continue;
      }
      compared++;
      const rules = rulesFor(policy, b.id);
      const confidence = rules.familyConfidence;
      const drop = differenceInterval(b.successes, b.runs, c.successes, c.runs, confidence);
      if (drop.difference === 0) continue;
      const percent = Math.round(confidence * 100);
      const allowedDrop = rules.familySuccessRateDrop;
      const supported = allowedDrop !== null && drop.lower > allowedDrop;
      const interval = `[${drop.lower.toFixed(2)}, ${drop.upper.toFixed(2)}]`;
      const noise = drop.difference > 0 && !supported ? ` (within noise: ${percent} % interval of the drop ${interval})` : '';
      const change = `${drop.difference > 0 ? '−' : '+'}${Math.abs(drop.difference).toFixed(2)}${noise}`;
      rows.push({
        scenario: b.id, baselineBuild: baseBuild, candidateBuild: candBuild, metric: 'family.successRate',
        baseline: b.successRate, candidate: c.successRate, change,
        rule: allowedDrop === null ? null : `no supported drop > ${allowedDrop} (Newcombe ${percent} %)`, broken: supported,
        ...(supported
          ? { reason: `family success rate fell from ${rate(b, confidence)} to ${rate(c, confidence)}; the ${percent} % interval of the drop ${interval} lies above ${allowedDrop} (Newcombe 1998 hybrid score)` }
          : {}),
      });
    }
  }
  return { rows, notComparable, compared };
}
