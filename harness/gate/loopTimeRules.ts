// Loop-time rules on the paired measurement (harness/bench/pairedTiming.ts): the candidate's tick
// against the baseline's, and against the scenario budgets, each judged by the confidence interval
// of a median. A rule blocks only when the whole interval lies beyond its limit; an interval that
// straddles the limit is reported "within noise" with the interval, never as a regression.

import type { PairedLoopTimeRecord } from '../results/loopTime.js';
import { judgeAgainstLimit, type MedianInterval } from '../score/medianInterval.js';
import type { GateRules } from './defaults.js';
import type { GateRow } from './types.js';

export type { PairedLoopTimeRecord } from '../results/loopTime.js';

/** Rows of loop-time judgements are filed under this pseudo-scenario (they span the suite). */
export const LOOP_TIME_SCENARIO = 'loop-time';

function interval(ci: MedianInterval, digits: number): string {
  const percent = Math.round(ci.confidence * 100);
  if (ci.lower === null || ci.upper === null) return `too few rounds (${ci.samples}) for a ${percent} % interval`;
  return `${percent} % interval ${ci.lower.toFixed(digits)}–${ci.upper.toFixed(digits)}`;
}

export function loopTimeRows(records: readonly PairedLoopTimeRecord[], buildPairs: [string, string][], rules: GateRules): GateRow[] {
  const rows: GateRow[] = [];
  for (const [baseBuild, candBuild] of buildPairs) {
    const record = records.find((r) => r.baselineBuild === baseBuild && r.candidateBuild === candBuild);
    if (record === undefined) continue;
    const at = { scenario: LOOP_TIME_SCENARIO, baselineBuild: baseBuild, candidateBuild: candBuild };
    const how = `${record.rounds} interleaved rounds over ${record.scenarios.length} scenario${record.scenarios.length === 1 ? '' : 's'}`;

    const slowdown = rules.loopTimeSlowdownFraction;
    const ratio = record.ratio;
    const ratioText = `×${ratio.median.toFixed(2)} (${interval(ratio, 2)})`;
    if (slowdown === null) {
      rows.push({ ...at, metric: 'loopTime.ratio', baseline: record.baselineTick_us, candidate: record.candidateTick_us, change: ratioText, rule: null, broken: false });
    } else {
      const verdict = judgeAgainstLimit(ratio, 1 + slowdown);
      const percent = Math.round(slowdown * 100);
      const broken = verdict === 'exceeds';
      rows.push({
        ...at, metric: 'loopTime.ratio', baseline: record.baselineTick_us, candidate: record.candidateTick_us,
        change: verdict === 'within-noise' ? `${ratioText}, within noise` : ratioText,
        rule: `slowdown ≤ +${percent} % (paired)`, broken,
        ...(broken ? {
          reason: `loop time: the candidate's tick takes ${ratio.median.toFixed(2)}× the baseline's ` +
            `(${record.baselineTick_us.toFixed(1)} → ${record.candidateTick_us.toFixed(1)} µs median; ${interval(ratio, 2)}, ${how}), more than the +${percent} % allowed`,
        } : {}),
      });
    }

    if (rules.allowLoopTimeOverBudget === false) {
      const budget = record.budgetRatio;
      const verdict = judgeAgainstLimit(budget, 1);
      if (verdict !== 'holds') {
        const broken = verdict === 'exceeds';
        rows.push({
          ...at, metric: 'loopTime.budgetRatio', baseline: null, candidate: budget.median,
          change: `${(budget.median * 100).toFixed(0)} % of budget (${interval(budget, 2)})${broken ? '' : ', within noise'}`,
          rule: 'tick ≤ loop budget (paired)', broken,
          ...(broken ? { reason: `loop time over budget: the candidate's tick takes ${budget.median.toFixed(2)}× the scenarios' loop budget (${interval(budget, 2)}, ${how})` } : {}),
        });
      }
    }
  }
  return rows;
}
