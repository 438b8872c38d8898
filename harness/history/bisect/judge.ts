// How a tested commit is judged against the good commit's results: by the whole gate policy
// (default), by one named gate rule, or by an absolute metric threshold on every run
// (`frictionMargin.min>=0.3`). A commit whose runs error is bad under every judge.

import type { GatePolicy, GateRules } from '../../gate/defaults.js';
import { GATE_RULE_NAMES } from '../../gate/defaults.js';
import { gate } from '../../gate/gate.js';
import type { ResultsFile } from '../../results/types.js';
import { runMetricValues } from '../metrics.js';

export type Judge =
  | { kind: 'gate'; text: string; policy: GatePolicy }
  | { kind: 'rule'; text: string; rule: keyof GateRules; metric: string; policy: GatePolicy }
  | { kind: 'threshold'; text: string; metric: string; op: '<' | '<=' | '>' | '>='; value: number };

/** The metric of the gate rows each rule judges (harness/gate/rules.ts, marginRules.ts). */
const RULE_METRIC: Partial<Record<keyof GateRules, string>> = {
  frictionMarginMinLoss: 'stanceMargin.min',
  frictionMarginP05Loss: 'stanceMargin.p05',
  slipDistanceGrowthFraction: 'slipDistance_m',
  slipDistanceGrowth_m: 'slipDistance_m',
  allowNewFalls: 'fell',
  allowNewCommandedViolations: 'violations.commanded',
  loopTimeP99GrowthFraction: 'loopTime_us.p99',
  allowLoopTimeOverBudget: 'loopTime_us.p99',
  criticalFrictionScaleRise: 'margin.friction.criticalScale',
  criticalPushScaleDrop: 'margin.push.criticalScale',
};

export class JudgeError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'JudgeError';
  }
}

/** `--rule` text → a judge; undefined → the whole gate policy. */
export function parseJudge(text: string | undefined, policy: GatePolicy): Judge {
  if (text === undefined || text === '' || text === 'gate') return { kind: 'gate', text: 'gate policy', policy };
  const threshold = /^([A-Za-z_][\w.]*)\s*(<=|>=|<|>)\s*(-?\d+(?:\.\d+)?(?:e-?\d+)?)$/.exec(text.trim());
  if (threshold) return { kind: 'threshold', text, metric: threshold[1], op: threshold[2] as '<' | '<=' | '>' | '>=', value: Number(threshold[3]) };
  const rule = text as keyof GateRules;
  const metric = RULE_METRIC[rule];
  if ((GATE_RULE_NAMES as readonly string[]).includes(text) && metric !== undefined) return { kind: 'rule', text, rule, metric, policy };
  const named = Object.keys(RULE_METRIC).join(', ');
  throw new JudgeError(`--rule ${JSON.stringify(text)}: expected "gate", a gate rule name (${named}) or a metric threshold such as frictionMargin.min>=0.3`);
}

export interface Judgement {
  verdict: 'good' | 'bad';
  /** Sentences: the broken rows or the runs beyond the threshold. */
  reasons: string[];
}

const holds = (value: number, op: string, limit: number) => (op === '<' ? value < limit : op === '<=' ? value <= limit : op === '>' ? value > limit : value >= limit);

export function judgeResults(judge: Judge, good: ResultsFile, candidate: ResultsFile): Judgement {
  const errors = candidate.runs.filter((r) => r.status === 'error').map((r) => `${r.scenario.id}: run errored: ${r.error?.message ?? r.reasons.join('; ')}`);
  if (judge.kind === 'threshold') {
    const reasons = [...errors];
    for (const run of candidate.runs) {
      if (run.status === 'error') continue;
      const value = runMetricValues(run).find(([name]) => name === judge.metric)?.[1];
      if (value === undefined) reasons.push(`${run.scenario.id}: ${judge.metric} not measured`);
      else if (!holds(value, judge.op, judge.value)) reasons.push(`${run.scenario.id}: ${judge.metric} = ${value} breaks ${judge.text}`);
    }
    return { verdict: reasons.length > 0 ? 'bad' : 'good', reasons };
  }
  const outcome = gate({ baseline: good, candidate, policy: judge.policy });
  const broken = outcome.rows.filter((row) => row.broken && (judge.kind === 'gate' || row.metric === judge.metric || row.metric === 'status'));
  const reasons = [...errors, ...broken.map((row) => `${row.scenario}: ${row.reason ?? `${row.metric} ${row.change} (${row.rule})`}`)];
  if (outcome.compared === 0) reasons.push('no run of this commit could be paired with the good commit\'s');
  return { verdict: reasons.length > 0 ? 'bad' : 'good', reasons };
}
